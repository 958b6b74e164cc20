namespace CopyNumber.Deterministic;

/// <summary>
/// The integration could not go on: a non-finite state or rate, a step size below round-off, or the step
/// limit. The message is meant for the user and names the time and the component (species) involved.
/// </summary>
public sealed class SolverFailureException : CopyNumberException
{
    /// <summary>Creates the exception.</summary>
    /// <param name="time">Model time at which the integration stopped.</param>
    /// <param name="componentName">Component (species) most involved, or null when none stands out.</param>
    /// <param name="reason">What went wrong, lower case, without the time.</param>
    public SolverFailureException(double time, string? componentName, string reason)
        : base(componentName is null
            ? $"the rate equations failed at t = {time:G10}: {reason}"
            : $"the rate equations failed at t = {time:G10}: {reason} ({componentName})", ErrorKind.RunFailed)
    {
        Time = time;
        ComponentName = componentName;
        Reason = reason;
    }

    /// <summary>Model time at which the integration stopped.</summary>
    public double Time { get; }

    /// <summary>Component (species) most involved, or null.</summary>
    public string? ComponentName { get; }

    /// <summary>What went wrong.</summary>
    public string Reason { get; }
}
