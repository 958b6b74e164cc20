using CopyNumber.Runs;
using System.CommandLine;
using System.Globalization;
using CopyNumber.Analysis;
using CopyNumber.Cli.Rendering;

namespace CopyNumber.Cli.Commands;

/// <summary>The verdict thresholds and figure choices shared by contrast, simulate and sweep.</summary>
internal sealed class ContrastOptions
{
    private static readonly ContrastThresholds Defaults = ContrastThresholds.Default;

    public Option<double> Z { get; } = new("--z") { Description = "Standard errors a deviation must exceed to count as resolved at one time (the 'resolved' column), and a mean must exceed for a CV or Fano factor.", DefaultValueFactory = _ => Defaults.Z };
    public Option<double> FalseAlarmRate { get; } = new("--false-alarm-rate") { Description = "Chance that a verdict fires on a model where it is false, per quantity and run over the whole grid, in (0, 0.5).", DefaultValueFactory = _ => Defaults.FalseAlarmRate };
    public Option<double> MeanShift { get; } = new("--mean-threshold") { Description = "Relative deviation of the mean from the rate equations that makes 'mean shifted'.", DefaultValueFactory = _ => Defaults.RelativeDeviation };
    public Option<double> Noise { get; } = new("--cv-threshold") { Description = "Coefficient of variation late in the run that makes 'noise-dominated'.", DefaultValueFactory = _ => Defaults.CoefficientOfVariation };
    public Option<double> Extinction { get; } = new("--extinction-threshold") { Description = "P(count = 0) at the final time that makes 'extinction-prone'.", DefaultValueFactory = _ => Defaults.ExtinctionProbability };
    public Option<long> MinimumReplicates { get; } = new("--min-replicates") { Description = "Fewer replicates than this give 'too few replicates' instead of a verdict.", DefaultValueFactory = _ => Defaults.MinimumReplicates };
    public Option<string?> At { get; } = new("--at") { Description = "Times for the histogram figures, comma-separated (default: the middle and the final time)." };
    public Option<string?> Heatmap { get; } = new("--heatmap") { Description = "Species or readout for the distribution heatmap." };
    public Option<string?> Pair { get; } = new("--pair") { Description = "Two species as A,B: their joint histogram at the histogram times (pair.parquet, counted over the stored paths; simulate then stores every replicate's path unless --paths says otherwise)." };

    public Option<string?> DualReporters { get; } = new("--dual-reporters") { Description = "Pairs of identical, independent reporter species in one cell as A:B[,C:D]: their noise split into intrinsic and extrinsic parts by the dual-reporter identities (report section 'Noise'; needs the pair's covariance, which a network of up to 10 species has by default)." };

    public void AddTo(Command command)
    {
        foreach (var option in new Option[] { Z, FalseAlarmRate, MeanShift, Noise, Extinction, MinimumReplicates, At, Heatmap, Pair, DualReporters })
            command.Options.Add(option);
    }

    public ContrastThresholds Thresholds(ParseResult parsed)
    {
        var thresholds = Defaults with
        {
            Z = parsed.GetValue(Z),
            FalseAlarmRate = parsed.GetValue(FalseAlarmRate),
            RelativeDeviation = parsed.GetValue(MeanShift),
            CoefficientOfVariation = parsed.GetValue(Noise),
            ExtinctionProbability = parsed.GetValue(Extinction),
            MinimumReplicates = parsed.GetValue(MinimumReplicates),
        };
        try
        {
            thresholds.Validate();
        }
        catch (AnalysisInputException e)
        {
            throw new UserInputException(e.Message);
        }
        return thresholds;
    }

    public IReadOnlyList<double> Times(ParseResult parsed)
    {
        var text = parsed.GetValue(At);
        if (string.IsNullOrWhiteSpace(text)) return [];
        var times = new List<double>();
        foreach (var part in text.Split(',', StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries))
        {
            if (!double.TryParse(part, NumberStyles.Float, CultureInfo.InvariantCulture, out var t) || !(t >= 0) || double.IsInfinity(t))
                throw new UserInputException($"--at takes non-negative times separated by commas (got '{part}')");
            times.Add(t);
        }
        return times;
    }

    /// <summary>
    /// The histogram times and heatmap quantity, checked against the model before a run starts, so that a
    /// misspelt --heatmap or an --at beyond --until is refused before the simulation rather than after it.
    /// </summary>
    public (IReadOnlyList<double> Times, string? Heatmap) Figures(ParseResult parsed, Network.ReactionNetwork network, double until)
    {
        var times = Times(parsed);
        var heatmap = parsed.GetValue(Heatmap);
        Reports.ContrastReport.CheckChoices([.. network.Species, .. network.Readouts.Select(r => r.Name)], until, times, heatmap);
        return (times, heatmap);
    }

    /// <summary>The two species of --pair A,B, checked against the model; null when it was not given.</summary>
    public (string First, string Second)? PairOf(ParseResult parsed, IReadOnlyList<string> species)
    {
        var text = parsed.GetValue(Pair);
        if (text is null) return null;
        var parts = text.Split(',', StringSplitOptions.TrimEntries);
        if (parts.Length != 2 || parts[0].Length == 0 || parts[0] == parts[1])
            throw new UserInputException($"--pair takes two different species as A,B (got '{text}')");
        foreach (var name in parts)
            if (!species.Contains(name, StringComparer.Ordinal))
                throw new UserInputException($"--pair: '{name}' is not a species of the model (species: {string.Join(", ", species)})");
        return (parts[0], parts[1]);
    }

    /// <summary>The reporter pairs of --dual-reporters A:B,C:D, checked against the model's species; empty when it was not given.</summary>
    public IReadOnlyList<(string First, string Second)> DualReportersOf(ParseResult parsed, IReadOnlyList<string> species)
    {
        var text = parsed.GetValue(DualReporters);
        if (string.IsNullOrWhiteSpace(text)) return [];
        var pairs = new List<(string, string)>();
        foreach (var item in text.Split(',', StringSplitOptions.TrimEntries))
        {
            var names = item.Split(':', StringSplitOptions.TrimEntries);
            if (names.Length != 2 || names[0].Length == 0 || names[0] == names[1])
                throw new UserInputException($"--dual-reporters takes pairs of two different species as A:B, separated by commas (got '{item}')");
            foreach (var name in names)
                if (!species.Contains(name, StringComparer.Ordinal))
                    throw new UserInputException($"--dual-reporters: '{name}' is not a species of the model (species: {string.Join(", ", species)})");
            pairs.Add((names[0], names[1]));
        }
        return pairs;
    }

    /// <summary>
    /// When the cells divide, one line: the LNA's variance at the final time split into the reactions' and the partitioning's
    /// parts, for each quantity that varies (docs/methods-analysis.md §1, "Noise by source").
    /// </summary>
    private static string RenderSources(RunContrastResult contrast)
    {
        if (contrast.NoiseSources is not { Sources: { } sources } lna) return "";
        var last = lna.Grid.Count - 1;
        var parts = Enumerable.Range(0, lna.Columns.Count).Where(c => lna.Variance(last, c) > 1e-9).Select(c =>
            $"{lna.Columns[c]} {Numbers.Format(lna.Variance(last, c), 4)} = {Numbers.Format(sources.Reactions(last, c), 4)} + {Numbers.Format(sources.Partitioning(last, c), 4)} " +
            $"({Numbers.Format(100 * sources.Partitioning(last, c) / lna.Variance(last, c), 3)}%)").ToArray();
        return parts.Length == 0 ? "" : $"LNA variance at t = {Numbers.Format(lna.Grid[last], 6)}, reactions + partitioning (share; partition-lna.parquet): {string.Join("; ", parts)}\n";
    }

    /// <summary>The verdict table printed at the end of contrast and simulate.</summary>
    public static string RenderVerdicts(RunContrastResult contrast)
    {
        var table = new TextTable("quantity", "verdict", "reason");
        foreach (var q in contrast.Quantities)
            foreach (var v in q.Verdicts)
                table.Add(q.Name, v.Label, v.Sentence);
        var phases = "";
        if (contrast.Quantities.Any(q => q.Phases.Count > 1))
        {
            // Each phase between the schedule's changes judged on its own, at the false-alarm rate shared out over the phases.
            var perPhase = new TextTable("phase", "span", "quantity", "verdict", "reason");
            foreach (var (q, p) in contrast.Quantities.SelectMany(q => q.Phases.Select(p => (q, p))).OrderBy(x => x.p.Phase.Index))
                foreach (var v in p.Contrast.Verdicts)
                    perPhase.Add(p.Phase.Index.ToString(CultureInfo.InvariantCulture), p.Phase.Span, q.Name, v.Label, v.Sentence);
            phases = "verdicts per phase of the schedule:\n" + perPhase;
        }
        // Switching is followed at the run's events; a multimodal quantity not followed gets the option that would follow it.
        var switching = string.Concat(contrast.SwitchingHints.Select(h => $"hint: {h}\n"));
        return table + phases + RenderSources(contrast) + $"error bars: {contrast.ErrorSource}\n" + (contrast.ExpansionStop is { } stop ? stop + "\n" : "") + switching + Contrast.Caution + "\n";
    }
}
