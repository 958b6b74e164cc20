namespace CopyNumber.Storage;

/// <summary>
/// Runs Parquet.Net's asynchronous calls to completion on the calling thread with no synchronization
/// context installed, so continuations never wait for a thread that is blocked on them.
/// </summary>
internal static class Synchronously
{
    public static T Run<T>(Func<Task<T>> operation)
    {
        var saved = SynchronizationContext.Current;
        SynchronizationContext.SetSynchronizationContext(null);
        try
        {
            return operation().GetAwaiter().GetResult();
        }
        finally
        {
            SynchronizationContext.SetSynchronizationContext(saved);
        }
    }

    public static void Run(Func<Task> operation) =>
        Run(async () =>
        {
            await operation();
            return true;
        });
}
