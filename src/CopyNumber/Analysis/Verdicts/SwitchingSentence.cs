using CopyNumber.Ensembles;

namespace CopyNumber.Analysis.Verdicts;

/// <summary>
/// The switching statistics of one species (<see cref="ModeSwitching"/>) in one sentence, for the console and the
/// report alike, and the hint given when the contrast finds a multimodal quantity whose switching was not followed.
/// </summary>
public static class SwitchingSentence
{
    /// <summary>
    /// "U (low core ≤ 9, high core ≥ 21, from the rate equations' stable steady states): 15.7 ± 0.372 switches per
    /// replicate over t = 0–500 minute (0.0315 per minute); mean residence in the low mode 32.7 ± 1.24 minute (1523
    /// completed), in the high mode 30.9 ± 0.809 minute (1624 completed)".
    /// </summary>
    /// <param name="s">The statistics.</param>
    /// <param name="source">Where the cores came from ("option", "steady-states") or null.</param>
    /// <param name="timeUnit">The model's time unit, or null.</param>
    public static string Describe(ModeSwitching s, string? source, string? timeUnit)
    {
        ArgumentNullException.ThrowIfNull(s);
        var unit = string.IsNullOrEmpty(timeUnit) ? "" : " " + timeUnit;
        var per = string.IsNullOrEmpty(timeUnit) ? "per time unit" : "per " + timeUnit;
        var from = source switch
        {
            "option" => ", as given",
            "steady-states" => ", from the rate equations' stable steady states",
            _ => "",
        };
        var text = $"{s.Species} (low core ≤ {s.Low}, high core ≥ {s.High}{from}): "
            + $"{VerdictText.Number(s.MeanSwitches)} ± {VerdictText.Number(s.SwitchesStandardError)} switches per replicate over t = 0–{VerdictText.Time(s.Span)}{unit} "
            + $"({VerdictText.Number(s.SwitchingRate)} {per}); mean residence in the low mode {Residence(s, 0, unit)}, in the high mode {Residence(s, 1, unit)}";
        var notes = new List<string>();
        if (s.NeverEntered > 0) notes.Add($"{VerdictText.Count(s.NeverEntered, "replicate", "replicates")} entered neither core");
        if (s.Excluded > 0) notes.Add($"{VerdictText.Count(s.Excluded, "replicate", "replicates")} stopped at the event limit left out");
        return notes.Count == 0 ? text : $"{text} ({string.Join("; ", notes)})";
    }

    private static string Residence(ModeSwitching s, int mode, string unit)
    {
        var exits = s.Mode(mode).Exits;
        if (exits == 0) return $"not resolved (no completed residence; {VerdictText.Percent(s.TimeFraction(mode))} of the time in it)";
        return $"{VerdictText.Number(s.MeanResidence(mode))} ± {VerdictText.Number(s.ResidenceStandardError(mode))}{unit} ({exits} completed)";
    }

    /// <summary>
    /// How to ask for switching statistics of a multimodal species whose modes were not followed: the option with
    /// cores a quarter of the way from each mode towards the other (the rule of <see cref="SteadyStates.SwitchingCores"/>).
    /// </summary>
    /// <param name="species">The species' name.</param>
    /// <param name="low">The lower mode's count.</param>
    /// <param name="high">The higher mode's count.</param>
    /// <returns>The hint, or null when the modes are too close for a boundary region between cores.</returns>
    public static string? Hint(string species, double low, double high)
    {
        var reach = SteadyStates.SwitchingCores.CoreReach * (high - low);
        var lowCore = Math.Floor(low + reach);
        var highCore = Math.Ceiling(high - reach);
        if (!(lowCore >= 0) || !(highCore - lowCore >= 2)) return null;
        return $"{species} is multimodal: for its switching statistics (switches per replicate, mean residence in each mode, counted at the events) "
            + $"run again with --switching {species}={lowCore:0}..{highCore:0}";
    }
}
