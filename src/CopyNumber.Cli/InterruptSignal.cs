using System.Runtime.InteropServices;

namespace CopyNumber.Cli;

/// <summary>
/// Turns Ctrl-C and SIGTERM into a cancellation, so that a command that honours it (simulate) writes
/// what it has finished before exiting with code 130. It is installed before the arguments are read;
/// while no command honours it, and on a second signal, the process exits with 130 at once.
/// </summary>
internal sealed class InterruptSignal : IDisposable
{
    private readonly CancellationTokenSource _source = new();
    private readonly PosixSignalRegistration _terminate;
    private readonly PosixSignalRegistration _interrupt;
    private readonly TextWriter _error;
    private int _honouring;

    public InterruptSignal(TextWriter error)
    {
        _error = error;
        _terminate = PosixSignalRegistration.Create(PosixSignal.SIGTERM, Handle);
        _interrupt = PosixSignalRegistration.Create(PosixSignal.SIGINT, Handle);
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
            _error.WriteLine();
            _error.WriteLine("stopping: finishing the summaries of the blocks done (signal again to quit at once)");
            _source.Cancel();
            return;
        }
        _error.WriteLine();
        _error.WriteLine("interrupted");
        Environment.Exit(ExitCodes.Interrupted);
    }

    public void Dispose()
    {
        _terminate.Dispose();
        _interrupt.Dispose();
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
