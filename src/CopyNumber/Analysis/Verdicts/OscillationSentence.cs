using System.Numerics;
using CopyNumber.Analysis.Oscillation;

namespace CopyNumber.Analysis.Verdicts;

/// <summary>The one sentence that says what the rate equations do, for `solve` and the contrast alike.</summary>
public static class OscillationSentence
{
    /// <summary>E.g. "the rate equations run on a stable limit cycle: period 36.2; p1 34.3 to 630, …; Floquet multipliers: trivial 1, largest other 0.163".</summary>
    public static string Describe(RateEquationOscillation o)
    {
        ArgumentNullException.ThrowIfNull(o);
        switch (o.Kind)
        {
            case OscillationKind.LimitCycle:
                var ranges = string.Join(", ", o.Ranges.Select(r => $"{r.Species} {N(r.Minimum)} to {N(r.Maximum)}"));
                var others = double.IsNaN(o.LargestNontrivialMultiplier) ? "" : $", largest other |μ| = {N(o.LargestNontrivialMultiplier)}";
                var neutral = o.NeutralDirections > 0 ? $" ({o.NeutralDirections} more at 1, one per conservation law)" : "";
                return $"the rate equations run on {(o.IsStableCycle ? "a stable" : "an unstable")} limit cycle: period {N(o.Period)}; range over one period (copies): {ranges}; "
                    + $"Floquet multipliers: trivial {o.FloquetMultipliers[0].Real.ToString("F6", System.Globalization.CultureInfo.InvariantCulture)}{neutral}{others}";
            case OscillationKind.DampedOscillation:
                return $"the rate equations spiral into a stable focus: least damped eigenvalues {Format(o.LeastDampedComplexPair!.Value)} "
                    + $"(period {N(o.Period)}, damping time {N(o.DampingTime)}); noise may keep such a circuit ringing (quasi-cycles)";
            default:
                return $"the rate equations do not oscillate: {o.Reason}";
        }
    }

    /// <summary>A complex number as "a ± bi" with three significant digits.</summary>
    public static string Format(Complex value) => $"{N(value.Real)} ± {N(Math.Abs(value.Imaginary))}i";

    private static string N(double x) => VerdictText.Number(x);
}
