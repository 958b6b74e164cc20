using System.CommandLine;
using CopyNumber.Cli.Commands;

namespace CopyNumber.Cli;

/// <summary>The command tree, built in one place so that tests run exactly what the binary runs.</summary>
internal static class CliApplication
{
    public static RootCommand BuildRoot(CliSession? session = null)
    {
        session ??= CliSession.Detached;
        var root = new RootCommand("CopyNumber: exact and approximate stochastic simulation of low-copy-number reaction networks, set against their rate equations.");
        root.Subcommands.Add(InspectCommand.Create());
        root.Subcommands.Add(SolveCommand.Create());
        root.Subcommands.Add(SimulateCommand.Create(session));
        root.Subcommands.Add(MergeCommand.Create());
        root.Subcommands.Add(ContrastCommand.Create());
        root.Subcommands.Add(SweepCommand.Create(session));
        root.Subcommands.Add(ScanCommand.Create(session));
        root.Subcommands.Add(ExactCommand.Create(session));
        root.Subcommands.Add(ImportCommand.Create());
        root.Subcommands.Add(ExportCommand.Create());
        return root;
    }

    /// <summary>Runs one command line, writing to the given streams; returns the exit code.</summary>
    public static int Run(string[] args, TextWriter? output = null, TextWriter? error = null, CliSession? session = null) =>
        CommandRunner.Run(BuildRoot(session), args, output, error);
}
