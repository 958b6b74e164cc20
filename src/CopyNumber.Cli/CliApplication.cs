using System.CommandLine;
using CopyNumber.Cli.Commands;

namespace CopyNumber.Cli;

/// <summary>The command tree, built in one place so that tests run exactly what the binary runs.</summary>
internal static class CliApplication
{
    public static RootCommand BuildRoot()
    {
        var root = new RootCommand("CopyNumber: exact and approximate stochastic simulation of low-copy-number reaction networks, set against their rate equations.");
        root.Subcommands.Add(InspectCommand.Create());
        root.Subcommands.Add(SolveCommand.Create());
        root.Subcommands.Add(SimulateCommand.Create());
        root.Subcommands.Add(ContrastCommand.Create());
        root.Subcommands.Add(SweepCommand.Create());
        return root;
    }

    /// <summary>Runs one command line, writing to the given streams; returns the exit code.</summary>
    public static int Run(string[] args, TextWriter? output = null, TextWriter? error = null) =>
        CommandRunner.Run(BuildRoot(), args, output, error);
}
