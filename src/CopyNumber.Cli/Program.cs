using CopyNumber.Cli;

using var interrupt = new InterruptSignal(Console.Error);
return CliApplication.Run(args, session: new CliSession(interrupt.Token, interrupt.Honour));
