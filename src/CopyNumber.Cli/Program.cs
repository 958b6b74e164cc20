using System.CommandLine;
using CopyNumber.Cli;
using CopyNumber.Cli.Commands;

var root = new RootCommand("CopyNumber: exact and approximate stochastic simulation of low-copy-number reaction networks, set against their rate equations.");
root.Subcommands.Add(InspectCommand.Create());
root.Subcommands.Add(SolveCommand.Create());
root.Subcommands.Add(SimulateCommand.Create());

return CommandRunner.Run(root, args);
