namespace CopyNumber.Storage;

/// <summary>Why a run ended; recorded in the manifest's <c>stop_reason</c> field by <see cref="StopReasons.Name"/>.</summary>
public enum StopReason
{
    /// <summary>Every block the run was responsible for is finished ("finished").</summary>
    Finished,
    /// <summary>Cancelled, e.g. by Ctrl-C or SIGTERM ("interrupted").</summary>
    Interrupted,
    /// <summary>The wall-clock limit was reached ("wall_limit").</summary>
    WallLimit,
    /// <summary>A replicate failed ("failed").</summary>
    Failed,
    /// <summary>A merge of shards that lacks some of them ("incomplete").</summary>
    Incomplete,
}

/// <summary>The manifest spelling of <see cref="StopReason"/>.</summary>
public static class StopReasons
{
    /// <summary>"finished", "interrupted", "wall_limit", "failed" or "incomplete".</summary>
    public static string Name(this StopReason reason) => reason switch
    {
        StopReason.Finished => "finished",
        StopReason.Interrupted => "interrupted",
        StopReason.WallLimit => "wall_limit",
        StopReason.Failed => "failed",
        _ => "incomplete",
    };
}
