using CopyNumber.Cli;

return CliApplication.Run(args);
