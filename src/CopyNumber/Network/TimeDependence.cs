using CopyNumber.Kinetics;
using CopyNumber.Language;

namespace CopyNumber.Network;

/// <summary>
/// Which reactions' rate laws read <c>time</c>, and for each of them a bound of its propensity over a window
/// of time at a fixed state (interval arithmetic, <see cref="IntervalLaw"/>), for exact simulation by
/// thinning (Voliotis, Thomas, Grima &amp; Bowsher 2016, PLoS Comput. Biol. 12:e1004923). Immutable and shared.
/// </summary>
public sealed class TimeDependence
{
    private readonly IntervalLaw?[] _bounds;

    internal TimeDependence(IntervalLaw?[] bounds)
    {
        _bounds = bounds;
        Reactions = Enumerable.Range(0, bounds.Length).Where(j => bounds[j] is not null).ToArray();
    }

    /// <summary>No reaction reads time.</summary>
    public static TimeDependence None(int reactions) => new(new IntervalLaw?[reactions]);

    /// <summary>The reactions whose laws read <c>time</c>, in increasing order.</summary>
    public IReadOnlyList<int> Reactions { get; }

    /// <summary>True when some law reads <c>time</c>.</summary>
    public bool Any => Reactions.Count > 0;

    /// <summary>Whether reaction <paramref name="reaction"/>'s law reads <c>time</c>.</summary>
    public bool ReadsTime(int reaction) => _bounds[reaction] is not null;

    /// <summary>
    /// An upper bound of reaction <paramref name="reaction"/>'s propensity for t in [<paramref name="t0"/>,
    /// <paramref name="t1"/>] at the given counts and parameters (+∞ or NaN when interval arithmetic cannot bound it there).
    /// </summary>
    internal double UpperBound(int reaction, long[] counts, double[] parameters, double t0, double t1) =>
        _bounds[reaction]!.Evaluate(counts, parameters, t0, t1).Hi;

    /// <summary>Lower and upper bounds of reaction <paramref name="reaction"/>'s propensity for t in [<paramref name="t0"/>, <paramref name="t1"/>].</summary>
    internal (double Lower, double Upper) Range(int reaction, long[] counts, double[] parameters, double t0, double t1)
    {
        var range = _bounds[reaction]!.Evaluate(counts, parameters, t0, t1);
        return (range.Lo, range.Hi);
    }

    /// <summary>The bounds of the rate laws that read time; null for the others. Used by the network compiler.</summary>
    internal static TimeDependence Compile(IReadOnlyList<Expr?> expandedRateLaws, ExpressionScope scope) =>
        new(expandedRateLaws.Select(law => law is not null && ExpressionGraph.NamesUsed(law).Contains(ExpressionScope.TimeName)
            ? IntervalLaw.Compile(law, scope) : null).ToArray());
}
