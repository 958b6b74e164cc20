using System.Globalization;

namespace CopyNumber.Ensembles;

/// <summary>
/// Exact integer sums over replicates of one mode's visits (<see cref="ModeSwitching"/>): the time attributed
/// to the mode per replicate, y, in fixed point (units of T/2^<see cref="ModeSwitching.TimeBits"/>), and its
/// completed residences (exits), x.
/// </summary>
/// <param name="Time">Σy, fixed point.</param>
/// <param name="TimeSquares">Σy², fixed point squared.</param>
/// <param name="Exits">Σx.</param>
/// <param name="ExitSquares">Σx².</param>
/// <param name="TimeExits">Σx·y.</param>
/// <param name="Censored">Replicates that ended in this mode: their last residence is cut by the end of the run.</param>
public sealed record ModeSums(Int128 Time, Int128 TimeSquares, long Exits, Int128 ExitSquares, Int128 TimeExits, long Censored)
{
    /// <summary>No replicates.</summary>
    public static readonly ModeSums Zero = new(0, 0, 0, 0, 0, 0);

    /// <summary>The sums over both parts.</summary>
    public ModeSums Add(ModeSums other)
    {
        ArgumentNullException.ThrowIfNull(other);
        return new(Time + other.Time, TimeSquares + other.TimeSquares, Exits + other.Exits, ExitSquares + other.ExitSquares,
            TimeExits + other.TimeExits, Censored + other.Censored);
    }
}

/// <summary>
/// The switching of one species between a low and a high mode over an ensemble, counted at the events
/// themselves with the cores fixed before the run (<see cref="Network.ModeCore"/>; docs/methods-analysis.md,
/// "Switching statistics"): switches per replicate over [0, T], and the mean residence time in each mode.
/// </summary>
/// <remarks>
/// <para>A residence runs from entering a mode's core until entering the other mode's core; a switch is such
/// an entry. The residence still running at T is censored: its time counts, its end does not. The mean
/// residence time is estimated as the total time in the mode over the completed residences,
/// τ̂ = Σy/Σx, which is the maximum-likelihood estimate for exponential residences under this censoring
/// (Cox &amp; Oakes 1984, Analysis of Survival Data, §3) and a consistent ratio estimate of the mean residence
/// for any residence law over long runs (renewal–reward theorem; common practice). Its standard error is the
/// ratio estimator's (delta method, replicates as independent clusters; Cochran 1977, Sampling Techniques,
/// §6.4): √(n/(n−1)·Σ(y_r − τ̂·x_r)²)/Σx, which holds without assuming exponential residences.</para>
/// <para>Kept as exact integer sums — times in fixed point of T/2^40 per replicate, so rounding happens once
/// per replicate and mode, not per addition — so blocks add exactly in any order and a resumed, sharded or
/// merged run gives the numbers one run gives. A replicate stopped at the event limit is left out
/// (<see cref="Excluded"/>).</para>
/// </remarks>
/// <param name="Species">Species name.</param>
/// <param name="SpeciesIndex">Index into the network's species.</param>
/// <param name="Low">Largest count of the low core (copies).</param>
/// <param name="High">Smallest count of the high core (copies).</param>
/// <param name="Span">T, the length of the run, in model time units.</param>
/// <param name="Replicates">n, the replicates counted.</param>
/// <param name="Excluded">Replicates left out (stopped at the event limit).</param>
/// <param name="NeverEntered">Counted replicates that entered neither core over the whole run.</param>
/// <param name="SwitchSum">ΣS, switches over the counted replicates.</param>
/// <param name="SwitchSquares">ΣS².</param>
/// <param name="LowMode">Sums of the low mode.</param>
/// <param name="HighMode">Sums of the high mode.</param>
public sealed record ModeSwitching(
    string Species, int SpeciesIndex, long Low, long High, double Span, long Replicates, long Excluded, long NeverEntered,
    long SwitchSum, Int128 SwitchSquares, ModeSums LowMode, ModeSums HighMode)
{
    /// <summary>Bits of the fixed-point time: a replicate's time in a mode is stored as round(t/T·2^40).</summary>
    public const int TimeBits = 40;

    /// <summary>2^<see cref="TimeBits"/>.</summary>
    public const double TimeScale = 1099511627776.0;

    /// <summary>No replicates yet, for the species and cores given.</summary>
    public static ModeSwitching Empty(string species, int index, long low, long high, double span) =>
        new(species, index, low, high, span, 0, 0, 0, 0, 0, ModeSums.Zero, ModeSums.Zero);

    /// <summary>The sums of mode <paramref name="mode"/> (0 low, 1 high).</summary>
    public ModeSums Mode(int mode) => mode == 0 ? LowMode : HighMode;

    /// <summary>Mean switches per replicate over [0, T]; NaN without replicates.</summary>
    public double MeanSwitches => Replicates > 0 ? (double)SwitchSum / Replicates : double.NaN;

    /// <summary>Standard error of <see cref="MeanSwitches"/> (sample variance with n − 1, exact from the integer sums); NaN below 2 replicates.</summary>
    public double SwitchesStandardError
    {
        get
        {
            if (Replicates < 2) return double.NaN;
            var scaled = Replicates * SwitchSquares - (Int128)SwitchSum * SwitchSum;
            var variance = (double)scaled / ((double)Replicates * (Replicates - 1));
            return Math.Sqrt(variance / Replicates);
        }
    }

    /// <summary>Switches per model time unit, <see cref="MeanSwitches"/>/T.</summary>
    public double SwitchingRate => MeanSwitches / Span;

    /// <summary>Mean residence time in mode <paramref name="mode"/> (model time units): total time in it over completed residences; NaN without a completed residence.</summary>
    public double MeanResidence(int mode)
    {
        var sums = Mode(mode);
        return sums.Exits > 0 ? (double)sums.Time / sums.Exits * Span / TimeScale : double.NaN;
    }

    /// <summary>Standard error of <see cref="MeanResidence"/> (the ratio estimator's; see the remarks); NaN below 2 replicates or without a completed residence.</summary>
    public double ResidenceStandardError(int mode)
    {
        var sums = Mode(mode);
        if (Replicates < 2 || sums.Exits == 0) return double.NaN;
        var ratio = (double)sums.Time / sums.Exits;
        // Σ(y − R·x)² = Σy² − 2R·Σxy + R²·Σx², in fixed-point units.
        var residual = (double)sums.TimeSquares - 2 * ratio * (double)sums.TimeExits + ratio * ratio * (double)sums.ExitSquares;
        residual = Math.Max(0, residual);
        return Math.Sqrt(Replicates / (Replicates - 1.0) * residual) / sums.Exits * Span / TimeScale;
    }

    /// <summary>Fraction of the replicates' total time T·n attributed to mode <paramref name="mode"/>.</summary>
    public double TimeFraction(int mode) => Replicates > 0 ? (double)Mode(mode).Time / TimeScale / Replicates : double.NaN;

    /// <summary>The statistics over the replicates of both parts (same species, cores and span).</summary>
    /// <exception cref="ArgumentException">The parts watched another species, other cores or another span.</exception>
    public ModeSwitching Add(ModeSwitching other)
    {
        ArgumentNullException.ThrowIfNull(other);
        if (other.Species != Species || other.Low != Low || other.High != High || other.Span != Span)
            throw new ArgumentException($"the switching of {other.Species} with cores ≤ {other.Low}, ≥ {other.High} over {other.Span} cannot be added to that of {Species} with cores ≤ {Low}, ≥ {High} over {Span}", nameof(other));
        return this with
        {
            Replicates = Replicates + other.Replicates,
            Excluded = Excluded + other.Excluded,
            NeverEntered = NeverEntered + other.NeverEntered,
            SwitchSum = SwitchSum + other.SwitchSum,
            SwitchSquares = SwitchSquares + other.SwitchSquares,
            LowMode = LowMode.Add(other.LowMode),
            HighMode = HighMode.Add(other.HighMode),
        };
    }

    /// <summary>The cores as <c>--switching</c> writes them.</summary>
    public string CoresText => string.Create(CultureInfo.InvariantCulture, $"{Species}={Low}..{High}");
}
