namespace CopyNumber.Network;

/// <summary>
/// The recording times 0, Δ, 2Δ, …, T shared by the rate equations and every simulator. Point k is
/// k·Δ computed by multiplication (never by repeated addition, which drifts); when T is not a whole
/// multiple of Δ the last point is T itself.
/// </summary>
public sealed class TimeGrid
{
    private readonly double[] _times;

    /// <summary>Creates the grid 0, <paramref name="every"/>, …, <paramref name="until"/>.</summary>
    /// <param name="until">Final time T &gt; 0, in model time units.</param>
    /// <param name="every">Spacing Δ, 0 &lt; Δ ≤ T.</param>
    public TimeGrid(double until, double every)
    {
        if (!(until > 0) || double.IsInfinity(until)) throw new ArgumentOutOfRangeException(nameof(until), "the final time must be positive and finite");
        if (!(every > 0) || every > until) throw new ArgumentOutOfRangeException(nameof(every), "the spacing must be positive and at most the final time");
        Until = until;
        Every = every;
        var whole = WholeSteps(until, every);
        var count = PointCount(until, every);
        _times = new double[count];
        for (var k = 0L; k <= whole; k++) _times[k] = k * every;
        _times[count - 1] = until;
    }

    /// <summary>
    /// The number of points the grid 0, <paramref name="every"/>, …, <paramref name="until"/> has, without
    /// building it: the whole steps k·Δ ≤ T, plus T itself when it is not one of them.
    /// </summary>
    public static long PointCount(double until, double every)
    {
        var whole = WholeSteps(until, every);
        var lastIsT = Math.Abs(whole * every - until) <= 1e-9 * until;
        return lastIsT ? whole + 1 : whole + 2;
    }

    // A relative slack of 1e-9 keeps T = 10, Δ = 0.1 at 101 points despite 10/0.1 = 99.999….
    private static long WholeSteps(double until, double every) => (long)Math.Floor(until / every * (1 + 1e-9));

    /// <summary>Final time T.</summary>
    public double Until { get; }

    /// <summary>Spacing Δ.</summary>
    public double Every { get; }

    /// <summary>Number of grid points, including 0 and T.</summary>
    public int Count => _times.Length;

    /// <summary>Grid point <paramref name="index"/>.</summary>
    public double this[int index] => _times[index];

    /// <summary>All grid points.</summary>
    public ReadOnlySpan<double> Times => _times;
}
