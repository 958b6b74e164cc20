using System.Runtime.InteropServices;

namespace CopyNumber.Cli;

/// <summary>
/// Turns Ctrl-C and SIGTERM into a cancellation the ensemble honours between replicates, instead of
/// killing the process, so that what has been finished is written before exiting with code 130.
/// </summary>
internal sealed class InterruptSignal : IDisposable
{
    private readonly CancellationTokenSource _source = new();
    private readonly PosixSignalRegistration _terminate;
    private readonly PosixSignalRegistration _interrupt;

    public InterruptSignal()
    {
        _terminate = PosixSignalRegistration.Create(PosixSignal.SIGTERM, Handle);
        _interrupt = PosixSignalRegistration.Create(PosixSignal.SIGINT, Handle);
    }

    public CancellationToken Token => _source.Token;

    public bool Raised => _source.IsCancellationRequested;

    private void Handle(PosixSignalContext context)
    {
        context.Cancel = true;
        _source.Cancel();
    }

    public void Dispose()
    {
        _terminate.Dispose();
        _interrupt.Dispose();
        _source.Dispose();
    }
}
