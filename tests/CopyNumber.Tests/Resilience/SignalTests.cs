using System.Diagnostics;
using System.Text;
using System.Text.RegularExpressions;
using CopyNumber.Cli;
using CopyNumber.Deterministic;
using CopyNumber.Network;
using CopyNumber.Storage;
using CopyNumber.Tests.Storage;
using static CopyNumber.Tests.Resilience.RunFolders;

namespace CopyNumber.Tests.Resilience;

/// <summary>
/// Signals in every phase (issue 10, fault 10): the real binary as a child process, sent SIGHUP, SIGQUIT,
/// SIGINT or SIGTERM with /bin/kill. POSIX's meaning of these signals is common practice: each asks the
/// process to stop (SIGHUP when its terminal or SSH session is gone). The waits are liveness limits so a
/// broken build cannot hang the suite, not measurements.
/// </summary>
public sealed partial class SignalTests
{
    private static readonly TimeSpan Patience = TimeSpan.FromSeconds(120);

    [Theory]
    [InlineData("HUP")]
    [InlineData("QUIT")]
    public void A_closed_session_or_a_quit_signal_stops_the_ensemble_like_sigterm_and_keeps_what_finished(string signal)
    {
        if (!OperatingSystem.IsLinux()) return; // /bin/kill and these signals are POSIX; CI runs Linux
        using var scratch = new ScratchFolder();
        var model = WriteModel(scratch);
        var folder = scratch.File("run");
        // About 250 million events: many seconds on any machine, so the signal arrives mid-ensemble (25 million
        // finished before the signal on an idle machine).
        using var child = Child.Start(["simulate", model, "--until", "20", "--every", "1", "--replicates", "500000", "--seed", "3", "--threads", "2", "--no-contrast", "--out", folder]);
        Assert.True(child.WaitForError(line => line.StartsWith("simulating", StringComparison.Ordinal), Patience), "the child never started simulating");
        Thread.Sleep(300);
        child.Signal(signal);
        Assert.True(child.Process.WaitForExit(Patience), $"the child did not stop after SIG{signal}");
        child.Process.WaitForExit();

        // Before: SIGHUP and SIGQUIT killed the process (exit 129 / 131), leaving no tables.
        Assert.Equal(ExitCodes.Interrupted, child.Process.ExitCode);
        Assert.DoesNotContain("   at ", child.AllText);
        var manifest = Manifest(folder);
        Assert.True(manifest.Partial);
        Assert.Equal("interrupted", manifest.ExtraText(ManifestFields.StopReason));
        Assert.True(File.Exists(Path.Combine(folder, RunFiles.Moments)));
    }

    [Fact]
    public void A_signal_during_the_contrast_stops_it_at_once_and_the_finished_tables_stay_whole()
    {
        if (!OperatingSystem.IsLinux()) return;
        using var scratch = new ScratchFolder();
        // Illustrative: a 150-step chain of first-order conversions. Its ensemble is short and its contrast
        // (the linear noise approximation of 151 species) long, so a signal sent when the ensemble's closing
        // line appears arrives during the contrast.
        var text = new StringBuilder("# illustrative: a long chain of conversions\nspecies\n");
        for (var i = 0; i <= 150; i++) text.Append($"  S{i} = {(i == 0 ? 100 : 0)}\n");
        text.Append("reactions\n");
        for (var i = 0; i < 150; i++) text.Append($"  r{i}: S{i} -> S{i + 1} mass 1\n");
        var model = WriteModel(scratch, text.ToString(), "chain.cnet");
        var folder = scratch.File("run");
        using var child = Child.Start(["simulate", model, "--until", "10", "--every", "0.1", "--replicates", "64", "--seed", "1", "--threads", "1", "--out", folder]);
        Assert.True(child.WaitForOutput(line => EnsembleClosingLine().IsMatch(line), Patience), "the ensemble never finished");
        child.Signal("INT");
        Assert.True(child.Process.WaitForExit(Patience), "the child did not stop after SIGINT");
        child.Process.WaitForExit();

        // Before: SIGINT was ignored during the contrast and the run exited 0 when the contrast was done.
        Assert.Equal(ExitCodes.Interrupted, child.Process.ExitCode);
        Assert.DoesNotContain("   at ", child.AllText);
        Assert.False(File.Exists(Path.Combine(folder, "contrast.parquet")), "the contrast ran to its end despite the signal");
        var manifest = Manifest(folder);
        Assert.False(manifest.Partial);
        Assert.Equal(64, manifest.ReplicatesFinished);
    }

    [Fact]
    public void The_rate_equation_solver_stops_at_its_next_step_when_cancelled()
    {
        // Common practice: cooperative cancellation is checked once per integration step.
        var network = ModelLoader.LoadText("species\n  A = 10\nreactions\n  decay: A -> 0 mass 1\n", "decay.cnet").Model!.Network;
        using var cancel = new CancellationTokenSource();
        cancel.Cancel();
        Assert.ThrowsAny<OperationCanceledException>(() =>
            RateEquationSolver.Solve(network, new TimeGrid(1000, 1), new SolverOptions { Cancel = cancel.Token }));
        // The same solve without the token runs to its end: A(t) = 10 e^{-t} (closed form of linear decay).
        var solution = RateEquationSolver.Solve(network, new TimeGrid(2, 1), new SolverOptions());
        Assert.Equal(10 * Math.Exp(-2), solution.Values[2, 0], 1e-5);
    }

    [GeneratedRegex(@"^\d+ replicates, \d+ events in ")]
    private static partial Regex EnsembleClosingLine();

    /// <summary>The built copynumber.dll under the dotnet host, its output lines watched as they arrive.</summary>
    private sealed class Child : IDisposable
    {
        private readonly StringBuilder _all = new();
        private readonly List<(Func<string, bool> Match, bool Error, ManualResetEventSlim Seen)> _waits = [];

        private Child(Process process) => Process = process;

        public Process Process { get; }

        public string AllText
        {
            get
            {
                lock (_all) return _all.ToString();
            }
        }

        public static Child Start(string[] arguments)
        {
            var child = new Child(ChildProcess.Start(arguments));
            child.Process.ErrorDataReceived += (_, e) => child.Line(e.Data, error: true);
            child.Process.OutputDataReceived += (_, e) => child.Line(e.Data, error: false);
            child.Process.BeginErrorReadLine();
            child.Process.BeginOutputReadLine();
            return child;
        }

        public bool WaitForError(Func<string, bool> match, TimeSpan patience) => Wait(match, error: true, patience);

        public bool WaitForOutput(Func<string, bool> match, TimeSpan patience) => Wait(match, error: false, patience);

        public void Signal(string name) => ChildProcess.Signal(Process.Id, name);

        private bool Wait(Func<string, bool> match, bool error, TimeSpan patience)
        {
            var seen = new ManualResetEventSlim();
            lock (_all)
            {
                // Lines already received count as well.
                foreach (var line in _all.ToString().Split('\n'))
                    if (line.StartsWith(error ? "E " : "O ", StringComparison.Ordinal) && match(line[2..])) return true;
                _waits.Add((match, error, seen));
            }
            return seen.Wait(patience);
        }

        private void Line(string? data, bool error)
        {
            if (data is null) return;
            lock (_all)
            {
                _all.Append(error ? "E " : "O ").Append(data).Append('\n');
                foreach (var (match, isError, seen) in _waits)
                    if (isError == error && match(data)) seen.Set();
            }
        }

        public void Dispose()
        {
            if (!Process.HasExited)
            {
                try
                {
                    Process.Kill(entireProcessTree: true);
                }
                catch (InvalidOperationException)
                {
                }
            }
            Process.Dispose();
        }
    }
}
