using System.Globalization;

namespace CopyNumber.Kinetics;

/// <summary>
/// The one sentence for a rate law that gave a negative, NaN or infinite value, shared by the stochastic
/// simulators (a propensity a(x)) and the rate equations (a rate v(x)), so that simulate and solve stop on the
/// same model with the same words. A rate law has no meaning below zero in either description.
/// </summary>
public static class UnusableRate
{
    /// <summary>True for a finite value ≥ 0.</summary>
    public static bool IsUsable(double value) => value >= 0 && value <= double.MaxValue;

    /// <summary>
    /// "reaction 'make' has propensity -5 at time 0; a propensity must be a finite number of at least 0 (state: X=10)".
    /// </summary>
    /// <param name="reaction">The reaction's name.</param>
    /// <param name="quantity">"propensity" (stochastic) or "rate" (rate equations).</param>
    /// <param name="value">The value the law gave.</param>
    /// <param name="time">Model time.</param>
    /// <param name="state">The state, already formatted (name=value, …).</param>
    public static string Describe(string reaction, string quantity, double value, double time, string state) =>
        $"reaction '{reaction}' has {quantity} {value.ToString("G", CultureInfo.InvariantCulture)} at time {time.ToString("G", CultureInfo.InvariantCulture)}; " +
        $"a {quantity} must be a finite number of at least 0 (state: {state})";
}
