using System.Globalization;
using System.Text.Json;
using CopyNumber.Ensembles;
using CopyNumber.Network;

namespace CopyNumber.Storage;

/// <summary>
/// The manifest's <c>mode_switching</c> field (<see cref="ManifestFields.ModeSwitching"/>): the switching
/// between the modes of each species given cores, written for readers with the integer sums that make it
/// exact to read back (resume, shards, merge). Sums past 2^63 are decimal text.
/// </summary>
public static class ModeSwitchingJson
{
    private static readonly string[] ModeNames = ["low", "high"];

    /// <summary>The field's value for <paramref name="switching"/>.</summary>
    public static object Write(IReadOnlyList<ModeSwitching> switching)
    {
        ArgumentNullException.ThrowIfNull(switching);
        return switching.Select(s => new Dictionary<string, object?>
        {
            ["species"] = s.Species,
            ["low_core_max"] = s.Low,
            ["high_core_min"] = s.High,
            ["over"] = s.Span,
            ["replicates"] = s.Replicates,
            ["excluded_replicates"] = s.Excluded,
            ["never_entered"] = s.NeverEntered,
            ["switches_mean"] = Finite(s.MeanSwitches),
            ["switches_std_error"] = Finite(s.SwitchesStandardError),
            ["switches_sum"] = s.SwitchSum,
            ["switches_sum_of_squares"] = Text(s.SwitchSquares),
            ["modes"] = Enumerable.Range(0, 2).ToDictionary(m => ModeNames[m], m => (object)new Dictionary<string, object?>
            {
                ["residence_mean"] = Finite(s.MeanResidence(m)),
                ["residence_std_error"] = Finite(s.ResidenceStandardError(m)),
                ["time_fixed_sum"] = Text(s.Mode(m).Time),
                ["time_fixed_sum_of_squares"] = Text(s.Mode(m).TimeSquares),
                ["exits_sum"] = s.Mode(m).Exits,
                ["exits_sum_of_squares"] = Text(s.Mode(m).ExitSquares),
                ["time_exits_sum"] = Text(s.Mode(m).TimeExits),
                ["censored"] = s.Mode(m).Censored,
            }),
        }).ToArray();
    }

    /// <summary>
    /// The cores whose modes the run in <paramref name="folder"/> followed, as its manifest records them under
    /// <see cref="ManifestFields.SwitchingArgument"/>; none when it records none.
    /// </summary>
    /// <exception cref="RunFolderException">The recorded cores do not read against the run's model.</exception>
    public static IReadOnlyList<ModeCore> Cores(RunManifest manifest, ReactionNetwork network, string folder)
    {
        ArgumentNullException.ThrowIfNull(manifest);
        if (!manifest.Arguments.TryGetValue(ManifestFields.SwitchingArgument, out var text)) return [];
        try
        {
            return ModeCore.Parse(text, network);
        }
        catch (ArgumentException e)
        {
            throw new RunFolderException($"'{folder}/manifest.json' records the switching cores '{text}', which do not read: {e.Message}", folder);
        }
    }

    /// <summary>
    /// The statistics stored in <paramref name="manifest"/> for <paramref name="cores"/> (the run's own); empty
    /// when the field is absent or does not match them, so that a combination then reports none rather than a
    /// partial sum.
    /// </summary>
    public static IReadOnlyList<ModeSwitching> Read(RunManifest manifest, IReadOnlyList<ModeCore> cores, double span)
    {
        ArgumentNullException.ThrowIfNull(manifest);
        ArgumentNullException.ThrowIfNull(cores);
        if (cores.Count == 0) return [];
        if (!manifest.Extra.TryGetValue(ManifestFields.ModeSwitching, out var value) || value is not JsonElement { ValueKind: JsonValueKind.Array } array)
            return [];
        var read = new List<ModeSwitching>();
        foreach (var item in array.EnumerateArray())
        {
            if (read.Count >= cores.Count) return [];
            var core = cores[read.Count];
            if (item.ValueKind != JsonValueKind.Object
                || !item.TryGetProperty("species", out var name) || name.GetString() != core.Name
                || !TryLong(item, "low_core_max", out var low) || low != core.Low
                || !TryLong(item, "high_core_min", out var high) || high != core.High
                || !TryLong(item, "replicates", out var replicates) || !TryLong(item, "excluded_replicates", out var excluded)
                || !TryLong(item, "never_entered", out var never) || !TryLong(item, "switches_sum", out var sum)
                || !TryBig(item, "switches_sum_of_squares", out var squares)
                || !item.TryGetProperty("modes", out var modes) || modes.ValueKind != JsonValueKind.Object)
                return [];
            var sums = new ModeSums[2];
            for (var m = 0; m < 2; m++)
            {
                if (!modes.TryGetProperty(ModeNames[m], out var mode) || mode.ValueKind != JsonValueKind.Object
                    || !TryBig(mode, "time_fixed_sum", out var time) || !TryBig(mode, "time_fixed_sum_of_squares", out var timeSquares)
                    || !TryLong(mode, "exits_sum", out var exits) || !TryBig(mode, "exits_sum_of_squares", out var exitSquares)
                    || !TryBig(mode, "time_exits_sum", out var timeExits) || !TryLong(mode, "censored", out var censored))
                    return [];
                sums[m] = new ModeSums(time, timeSquares, exits, exitSquares, timeExits, censored);
            }
            read.Add(new ModeSwitching(core.Name, core.Species, core.Low, core.High, span, replicates, excluded, never, sum, squares, sums[0], sums[1]));
        }
        return read.Count == cores.Count ? read : [];
    }

    private static string Text(Int128 value) => value.ToString(CultureInfo.InvariantCulture);

    private static bool TryLong(JsonElement item, string name, out long value) => SwitchingJson.TryLong(item, name, out value);

    private static bool TryBig(JsonElement item, string name, out Int128 value)
    {
        value = 0;
        return item.TryGetProperty(name, out var element) && element.ValueKind == JsonValueKind.String
            && Int128.TryParse(element.GetString(), NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out value);
    }

    private static double? Finite(double value) => SwitchingJson.Finite(value);
}
