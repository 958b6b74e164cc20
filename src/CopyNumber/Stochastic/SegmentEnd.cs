namespace CopyNumber.Stochastic;

/// <summary>Why an exact simulator stopped advancing.</summary>
internal enum SegmentEnd
{
    /// <summary>The next event would fall after the horizon: time is now the horizon, the pending event discarded.</summary>
    Horizon,
    /// <summary>The requested number of events has fired.</summary>
    Budget,
    /// <summary>The replicate's event limit was reached before the horizon.</summary>
    EventLimit,
    /// <summary>
    /// An event made a state-triggered change's condition turn true: time is the event's, the change waits
    /// in <see cref="TriggerWatch"/> for the caller to apply it and refresh the propensities.
    /// </summary>
    Triggered,
}
