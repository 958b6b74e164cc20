using CopyNumber.Analysis;

namespace CopyNumber.Runs.Scans;

/// <summary>
/// The verdicts' error rate over a whole map. Each verdict of one run is a test at level α per quantity
/// (<see cref="ContrastThresholds.FalseAlarmRate"/>, holding over the run's grid). A map of M points runs M
/// such tests per quantity and verdict; at each point the scan runs them at α/M, so by Bonferroni's
/// inequality the chance that a map carries any false verdict of a kind on a quantity is at most α, under any
/// dependence between the points (family-wise rule; common practice). A family-wise rule rather than a
/// false-discovery rule (Benjamini &amp; Hochberg 1995) because common random numbers make neighbouring
/// points strongly dependent, for which the Bonferroni bound holds as it stands, and because a map is read
/// point by point ("is this point adequate?"), where one false verdict already misleads. M is the number of
/// points of the whole map, not of a shard, so every shard judges alike.
/// </summary>
public static class ScanErrorRate
{
    /// <summary>The thresholds each point is judged with: those of the map with α divided by the map's points.</summary>
    public static ContrastThresholds PerPoint(ContrastThresholds map, int points)
    {
        ArgumentNullException.ThrowIfNull(map);
        ArgumentOutOfRangeException.ThrowIfLessThan(points, 1);
        return map with { FalseAlarmRate = map.FalseAlarmRate / points };
    }
}
