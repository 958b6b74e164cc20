using System.Globalization;

namespace CopyNumber.Ensembles;

/// <summary>
/// The switching of one two-state species (a quantity the model confines to 0 and 1, see
/// <see cref="Network.TwoStateSpecies"/>) over an ensemble: the number of switches S each replicate made
/// over the whole run [0, T], counted at the events themselves (every firing of a reaction that changes
/// the species, plus flips made by schedule changes after t = 0), never from grid snapshots.
/// </summary>
/// <remarks>
/// Kept as exact integer sums (n, ΣS, ΣS²), so results over disjoint blocks add exactly, in any order,
/// and a resumed or merged run gives the numbers one run gives. A replicate counts only when it reached
/// T (not stopped at the event limit) and the schedule left the species' confining law intact; the
/// others are counted in <see cref="Excluded"/>.
/// </remarks>
/// <param name="Species">Species name.</param>
/// <param name="SpeciesIndex">Index into the network's species.</param>
/// <param name="Span">T, the length of the run the switches are counted over, in model time units.</param>
/// <param name="Replicates">n, the replicates counted.</param>
/// <param name="Sum">ΣS over the counted replicates.</param>
/// <param name="SumOfSquares">ΣS² over the counted replicates.</param>
/// <param name="Excluded">Replicates left out: stopped at the event limit, or the schedule broke the confining law.</param>
public sealed record SwitchingStatistics(string Species, int SpeciesIndex, double Span, long Replicates, long Sum, Int128 SumOfSquares, long Excluded)
{
    /// <summary>Mean switches per replicate over [0, T]; NaN without replicates.</summary>
    public double Mean => Replicates > 0 ? (double)Sum / Replicates : double.NaN;

    /// <summary>Sample variance (n − 1 denominator) of the switches per replicate, computed exactly from the integer sums; NaN below 2 replicates.</summary>
    public double Variance
    {
        get
        {
            if (Replicates < 2) return double.NaN;
            // n·ΣS² − (ΣS)² is exact in 128 bits for any count a run can reach.
            var scaled = Replicates * SumOfSquares - (Int128)Sum * Sum;
            return (double)scaled / ((double)Replicates * (Replicates - 1));
        }
    }

    /// <summary>Standard error of <see cref="Mean"/>.</summary>
    public double StandardError => Math.Sqrt(Variance / Replicates);

    /// <summary>Mean switching rate over the run, <see cref="Mean"/>/T, in switches per model time unit.</summary>
    public double MeanRate => Mean / Span;

    /// <summary>The statistics over the replicates of both parts (same species and span).</summary>
    public SwitchingStatistics Add(SwitchingStatistics other)
    {
        ArgumentNullException.ThrowIfNull(other);
        if (other.Species != Species || other.Span != Span) throw new ArgumentException($"switching of '{other.Species}' over {other.Span} cannot be added to that of '{Species}' over {Span}", nameof(other));
        return this with
        {
            Replicates = Replicates + other.Replicates,
            Sum = Sum + other.Sum,
            SumOfSquares = SumOfSquares + other.SumOfSquares,
            Excluded = Excluded + other.Excluded,
        };
    }

    /// <summary>ΣS² as invariant decimal text (it may pass 2^63, beyond a JSON number's safe range).</summary>
    public string SumOfSquaresText => SumOfSquares.ToString(CultureInfo.InvariantCulture);
}
