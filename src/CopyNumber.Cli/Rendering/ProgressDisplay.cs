using System.Diagnostics;
using CopyNumber.Ensembles;

namespace CopyNumber.Cli.Rendering;

/// <summary>
/// Progress of an ensemble on stderr: a redrawn one-line bar when stderr is a terminal, otherwise a plain
/// line every few seconds (log files and batch schedulers get readable text, not control characters).
/// </summary>
internal sealed class ProgressDisplay : IDisposable
{
    private readonly EnsembleMonitor _monitor;
    private readonly long _total;
    private readonly TextWriter _error;
    private readonly bool _terminal;
    private readonly Stopwatch _clock = Stopwatch.StartNew();
    private readonly Timer _timer;
    private bool _drewBar;

    public ProgressDisplay(EnsembleMonitor monitor, long total, TextWriter error, bool terminal)
    {
        _monitor = monitor;
        _total = total;
        _error = error;
        _terminal = terminal;
        var period = terminal ? TimeSpan.FromMilliseconds(250) : TimeSpan.FromSeconds(5);
        _timer = new Timer(_ => Draw(), null, period, period);
    }

    private void Draw()
    {
        var done = _monitor.ReplicatesDone;
        var seconds = Math.Max(_clock.Elapsed.TotalSeconds, 1e-9);
        var eventsPerSecond = _monitor.EventsFired / seconds;
        var fraction = _total > 0 ? Math.Min(1.0, (double)done / _total) : 1;
        var leftText = TimeLeft.Describe(seconds, done, _total);
        lock (_error)
        {
            if (_terminal)
            {
                const int width = 30;
                var filled = (int)Math.Round(fraction * width);
                _error.Write($"\r[{new string('#', filled)}{new string('.', width - filled)}] {done}/{_total} replicates  {Numbers.Format(eventsPerSecond, 3)} events/s  {leftText}   ");
                _drewBar = true;
            }
            else
                _error.WriteLine($"progress: {done}/{_total} replicates ({fraction:P0}), {Numbers.Format(eventsPerSecond, 3)} events/s, {leftText}");
        }
    }

    public void Dispose()
    {
        _timer.Dispose();
        lock (_error)
            if (_drewBar) _error.Write("\r" + new string(' ', 100) + "\r");
    }
}
