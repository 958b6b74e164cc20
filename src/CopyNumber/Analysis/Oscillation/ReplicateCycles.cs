namespace CopyNumber.Analysis.Oscillation;

/// <summary>
/// One replicate's cycles, counted by a trigger with hysteresis (common practice for noisy oscillations): a cycle
/// starts where the path crosses its own time average upwards, counted only when the path has been below the lower
/// level (average − h) since the previous start and then reaches the upper level (average + h), with
/// h = <see cref="HysteresisFraction"/> × half the range between the path's 10% and 90% quantiles. Noise around the
/// average thus never counts as a cycle. The crossing time is interpolated linearly between the recorded points.
/// </summary>
/// <param name="Starts">The cycles' start times (upward crossings), in model time units from the path's first point.</param>
/// <param name="Amplitudes">Per complete cycle (between successive starts), half its peak-to-trough range, in copies.</param>
public sealed record ReplicateCycles(double[] Starts, double[] Amplitudes)
{
    /// <summary>The hysteresis half-width as a fraction of half the 10%–90% quantile range.</summary>
    public const double HysteresisFraction = 0.25;

    /// <summary>Complete cycles (between successive starts).</summary>
    public int Count => Math.Max(0, Starts.Length - 1);

    /// <summary>The replicate's period: the mean length of its complete cycles; NaN with fewer than two.</summary>
    public double Period => Count >= 2 ? (Starts[^1] - Starts[0]) / Count : double.NaN;

    /// <summary>The replicate's amplitude: the mean over its complete cycles; NaN with fewer than two.</summary>
    public double Amplitude => Count >= 2 ? Amplitudes.Average() : double.NaN;

    /// <summary>Points of the centred moving average the path is smoothed with before counting (an eighth of a period at the sample's 40 points per period).</summary>
    public const int SmoothingPoints = 5;

    /// <summary>Counts the cycles of <paramref name="raw"/>, recorded every <paramref name="step"/> time units, after a centred moving average of <see cref="SmoothingPoints"/> points (so that a low-copy species' jitter does not start cycles of its own); amplitudes are read on the raw path.</summary>
    public static ReplicateCycles Of(double[] raw, double step)
    {
        ArgumentNullException.ThrowIfNull(raw);
        if (raw.Length < 3) return new ReplicateCycles([], []);
        var path = Smooth(raw);
        var average = path.Average();
        var sorted = path.OrderBy(x => x).ToArray();
        var spread = (sorted[(int)(0.9 * (sorted.Length - 1))] - sorted[(int)(0.1 * (sorted.Length - 1))]) / 2;
        if (!(spread > 0)) return new ReplicateCycles([], []);
        var h = HysteresisFraction * spread;
        var starts = new List<int>();      // index k: the crossing lies in (k − 1, k]
        var times = new List<double>();
        var armed = false;                 // been below the lower level since the last start
        var lastUp = -1;                   // the latest upward crossing of the average since arming
        for (var k = 1; k < path.Length; k++)
        {
            if (path[k] < average - h) { armed = true; lastUp = -1; continue; }
            if (armed && path[k - 1] < average && path[k] >= average) lastUp = k;
            if (armed && lastUp > 0 && path[k] > average + h)
            {
                var fraction = (average - path[lastUp - 1]) / (path[lastUp] - path[lastUp - 1]);
                times.Add((lastUp - 1 + fraction) * step);
                starts.Add(lastUp);
                armed = false;
                lastUp = -1;
            }
        }
        var amplitudes = new double[Math.Max(0, starts.Count - 1)];
        for (var c = 0; c < amplitudes.Length; c++)
        {
            double lo = double.PositiveInfinity, hi = double.NegativeInfinity;
            for (var k = starts[c]; k < starts[c + 1]; k++) { lo = Math.Min(lo, raw[k]); hi = Math.Max(hi, raw[k]); }
            amplitudes[c] = (hi - lo) / 2;
        }
        return new ReplicateCycles(times.ToArray(), amplitudes);
    }

    private static double[] Smooth(double[] x)
    {
        var half = SmoothingPoints / 2;
        var smooth = new double[x.Length];
        for (var k = 0; k < x.Length; k++)
        {
            int from = Math.Max(0, k - half), to = Math.Min(x.Length - 1, k + half);
            var sum = 0.0;
            for (var j = from; j <= to; j++) sum += x[j];
            smooth[k] = sum / (to - from + 1);
        }
        return smooth;
    }
}
