using System.Globalization;
using System.Text.Json;
using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.Storage;

/// <summary>
/// The manifest's <c>switching</c> field (<see cref="ManifestFields.Switching"/>): written for readers,
/// with the integer sums that make it exact to read back.
/// </summary>
internal static class SwitchingJson
{
    public static object Write(IReadOnlyList<SwitchingStatistics> switching) =>
        switching.Select(s => new Dictionary<string, object?>
        {
            ["species"] = s.Species,
            ["over"] = s.Span,
            ["replicates"] = s.Replicates,
            ["excluded_replicates"] = s.Excluded,
            ["mean"] = Finite(s.Mean),
            ["variance"] = Finite(s.Variance),
            ["std_error"] = Finite(s.StandardError),
            ["mean_rate"] = Finite(s.MeanRate),
            ["switches_sum"] = s.Sum,
            ["switches_sum_of_squares"] = s.SumOfSquaresText,
        }).ToArray();

    /// <summary>
    /// The statistics stored in <paramref name="manifest"/>, for <paramref name="network"/>'s two-state
    /// species; empty when the field is absent or does not match them (a run stored before the field
    /// existed), so a combination then reports none rather than a partial sum.
    /// </summary>
    public static IReadOnlyList<SwitchingStatistics> Read(RunManifest manifest, ReactionNetwork network, double span)
    {
        var twoState = TwoStateSpecies.Of(network);
        if (!manifest.Extra.TryGetValue(ManifestFields.Switching, out var value) || value is not JsonElement { ValueKind: JsonValueKind.Array } array)
            return [];
        var read = new List<SwitchingStatistics>();
        foreach (var item in array.EnumerateArray())
        {
            if (read.Count >= twoState.Count) return [];
            var species = twoState.Species[read.Count];
            if (item.ValueKind != JsonValueKind.Object
                || !item.TryGetProperty("species", out var name) || name.GetString() != network.Species[species]
                || !TryLong(item, "replicates", out var replicates) || !TryLong(item, "excluded_replicates", out var excluded)
                || !TryLong(item, "switches_sum", out var sum)
                || !item.TryGetProperty("switches_sum_of_squares", out var squaresText)
                || !Int128.TryParse(squaresText.GetString(), NumberStyles.None, CultureInfo.InvariantCulture, out var squares))
                return [];
            read.Add(new SwitchingStatistics(network.Species[species], species, span, replicates, sum, squares, excluded));
        }
        return read.Count == twoState.Count ? read : [];
    }

    internal static bool TryLong(JsonElement item, string name, out long value)
    {
        value = 0;
        return item.TryGetProperty(name, out var element) && element.ValueKind == JsonValueKind.Number && element.TryGetInt64(out value);
    }

    // JSON has no NaN: an undefined statistic is written as null.
    internal static double? Finite(double value) => double.IsFinite(value) ? value : null;
}
