using System.Globalization;
using CopyNumber.Randomness;

namespace CopyNumber.Runs.Scans;

/// <summary>
/// Where a scan's points lie: every combination of the axes' values (<c>grid</c>, the default), or a
/// Latin hypercube of N points (<c>latin:N</c>; McKay, Beckman &amp; Conover 1979, Technometrics 21:239):
/// each range is cut into N equal strata (equal in the logarithm for a log range), every stratum of every
/// axis holds exactly one point at a uniform position within it, and the strata are paired across axes by
/// independent random permutations. The draws come from the scan seed, so a design is reproduced exactly.
/// </summary>
/// <param name="LatinPoints">N of a Latin hypercube; null for the full grid.</param>
public sealed record ScanDesign(int? LatinPoints)
{
    /// <summary>Most points in one scan.</summary>
    public const int MaximumPoints = 100_000;

    /// <summary>The full grid.</summary>
    public static ScanDesign Grid { get; } = new((int?)null);

    /// <summary>Reads <c>grid</c> or <c>latin:N</c>.</summary>
    public static ScanDesign Parse(string? text)
    {
        if (text is null or "grid") return Grid;
        if (text.StartsWith("latin:", StringComparison.Ordinal)
            && int.TryParse(text["latin:".Length..], NumberStyles.None, CultureInfo.InvariantCulture, out var n) && n >= 2 && n <= MaximumPoints)
            return new ScanDesign(n);
        throw new ScanInputException($"--design takes grid or latin:N with N from 2 to {MaximumPoints} (got '{text}')");
    }

    /// <summary>The design's text as the scan records it.</summary>
    public override string ToString() => LatinPoints is { } n ? $"latin:{n.ToString(CultureInfo.InvariantCulture)}" : "grid";

    /// <summary>The points, numbered from 0: a grid varies the last axis fastest.</summary>
    /// <exception cref="ScanInputException">Too many points, or a Latin hypercube over an axis given as a list.</exception>
    public IReadOnlyList<ScanPoint> Points(IReadOnlyList<ScanAxis> axes, ulong seed)
    {
        ArgumentNullException.ThrowIfNull(axes);
        if (axes.Count == 0) throw new ScanInputException("a scan needs at least one --vary NAME=SPEC");
        if (axes.Select(a => a.Name).Distinct().Count() != axes.Count) throw new ScanInputException("each name may be varied once");
        return LatinPoints is { } n ? Latin(axes, n, seed) : FullGrid(axes);
    }

    private static List<ScanPoint> FullGrid(IReadOnlyList<ScanAxis> axes)
    {
        var total = axes.Aggregate(1.0, (p, a) => p * a.Values.Count);
        if (total > MaximumPoints) throw new ScanInputException($"the grid has {total:G6} points, more than {MaximumPoints}; use fewer values or --design latin:N");
        var points = new List<ScanPoint>((int)total);
        var index = new int[axes.Count];
        for (var p = 0; p < (int)total; p++)
        {
            points.Add(new ScanPoint(p, axes.Select((a, i) => a.Values[index[i]]).ToArray()));
            for (var i = axes.Count - 1; i >= 0; i--)
            {
                if (++index[i] < axes[i].Values.Count) break;
                index[i] = 0;
            }
        }
        return points;
    }

    private static List<ScanPoint> Latin(IReadOnlyList<ScanAxis> axes, int n, ulong seed)
    {
        if (axes.FirstOrDefault(a => a.Range is null) is { } list)
            throw new ScanInputException($"--design latin:{n} draws within ranges: give --vary {list.Name} as lo:hi:lin|log:count (its count is not used)");
        if (axes.FirstOrDefault(a => a.Target == ScanTarget.InitialCount) is { } count)
            throw new ScanInputException($"--design latin:{n} draws real values, and the initial count of '{count.Name}' is a whole number: vary it on a grid");
        // A stream apart from every replicate's: the replicate streams are derived from the seed by index from 0.
        var random = ReplicateStreams.For(seed, long.MinValue);
        var columns = new double[axes.Count][];
        for (var a = 0; a < axes.Count; a++)
        {
            var order = Enumerable.Range(0, n).ToArray();
            for (var i = n - 1; i > 0; i--) // Fisher–Yates
            {
                var j = (int)(random.NextUInt64() % (ulong)(i + 1));
                (order[i], order[j]) = (order[j], order[i]);
            }
            columns[a] = order.Select(stratum => axes[a].Range!.At((stratum + random.NextDouble()) / n)).ToArray();
        }
        return Enumerable.Range(0, n).Select(p => new ScanPoint(p, columns.Select(c => c[p]).ToArray())).ToList();
    }
}
