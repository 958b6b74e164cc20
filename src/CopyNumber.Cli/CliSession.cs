namespace CopyNumber.Cli;

/// <summary>
/// What a command needs from the process it runs in: the cancellation raised by Ctrl-C or SIGTERM, and
/// a way to say that it honours it. The binary passes its <see cref="InterruptSignal"/>; tests pass a
/// token of their own.
/// </summary>
internal sealed class CliSession
{
    private readonly Func<IDisposable> _honour;

    public CliSession(CancellationToken interrupt, Func<IDisposable>? honour = null)
    {
        Interrupt = interrupt;
        _honour = honour ?? (() => NoSpan.Instance);
    }

    /// <summary>A session that is never interrupted.</summary>
    public static CliSession Detached => new(CancellationToken.None);

    public CancellationToken Interrupt { get; }

    /// <summary>While the result is not disposed, a signal cancels <see cref="Interrupt"/> instead of ending the process.</summary>
    public IDisposable Honour() => _honour();

    private sealed class NoSpan : IDisposable
    {
        public static readonly NoSpan Instance = new();

        public void Dispose()
        {
        }
    }
}
