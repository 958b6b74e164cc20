using CopyNumber.Benchmarks;

if (args.Length > 0 && args[0] == "quick") QuickTiming.Run(args);
else if (args.Length > 0 && args[0] == "exact") MasterEquationTiming.Run(args);
else BenchmarkDotNet.Running.BenchmarkSwitcher.FromAssembly(typeof(Program).Assembly).Run(args);
