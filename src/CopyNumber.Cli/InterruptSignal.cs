using System.Runtime.InteropServices;

namespace CopyNumber.Cli;

/// <summary>
/// Turns Ctrl-C (SIGINT), SIGTERM, SIGHUP (a closed terminal or SSH session) and SIGQUIT into a cancellation, so that a command that honours it (simulate) writes
/// what it has finished before exiting with code 130. It is installed before the arguments are read;
/// while no command honours it, and on a second signal, the process exits with 130 at once.
/// </summary>
internal sealed class InterruptSignal : IDisposable
{
    private readonly CancellationTokenSource _source = new();
    private readonly PosixSignalRegistration[] _registrations;
    private readonly TextWriter _error;
    private int _honouring;

    public InterruptSignal(TextWriter error)
    {
        _error = error;
        // All four mean "stop": a job scheduler's SIGTERM, Ctrl-C, a dropped SSH session's SIGHUP, Ctrl-\.
        _registrations = [.. new[] { PosixSignal.SIGTERM, PosixSignal.SIGINT, PosixSignal.SIGHUP, PosixSignal.SIGQUIT }
            .Select(signal => PosixSignalRegistration.Create(signal, Handle))];
    }

    public CancellationToken Token => _source.Token;

    /// <summary>Marks the span in which a command honours the cancellation; dispose the result to end it.</summary>
    public IDisposable Honour()
    {
        Interlocked.Increment(ref _honouring);
        return new Span(this);
    }

    private void Handle(PosixSignalContext context)
    {
        context.Cancel = true;
        if (Volatile.Read(ref _honouring) > 0 && !_source.IsCancellationRequested)
        {
            Say("stopping: finishing the summaries of the blocks done (signal again to quit at once)");
            _source.Cancel();
            return;
        }
        Say("interrupted");
        Environment.Exit(ExitCodes.Interrupted);
    }

    /// <summary>After SIGHUP the terminal may be gone; a message that cannot be shown must not stop the shutdown.</summary>
    private void Say(string message)
    {
        try
        {
            _error.WriteLine();
            _error.WriteLine(message);
        }
        catch (Exception e) when (e is IOException or ObjectDisposedException)
        {
        }
    }

    public void Dispose()
    {
        foreach (var registration in _registrations) registration.Dispose();
        _source.Dispose();
    }

    private sealed class Span(InterruptSignal owner) : IDisposable
    {
        private int _disposed;

        public void Dispose()
        {
            if (Interlocked.Exchange(ref _disposed, 1) == 0) Interlocked.Decrement(ref owner._honouring);
        }
    }
}
