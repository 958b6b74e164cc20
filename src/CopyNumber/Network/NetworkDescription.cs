using System.Text.Json;
using System.Text.Json.Serialization;

namespace CopyNumber.Network;

/// <summary>
/// Everything <c>copynumber inspect</c> reports about a compiled network, as plain data. Its JSON field
/// names (snake_case) are a stable interface documented in docs/inspect-json.md.
/// </summary>
public sealed record NetworkDescription(
    [property: JsonPropertyName("model")] string Model,
    [property: JsonPropertyName("size")] double Size,
    [property: JsonPropertyName("species")] IReadOnlyList<SpeciesDescription> Species,
    [property: JsonPropertyName("parameters")] IReadOnlyList<ParameterDescription> Parameters,
    [property: JsonPropertyName("reactions")] IReadOnlyList<ReactionDescription> Reactions,
    [property: JsonPropertyName("stoichiometry")] IReadOnlyList<IReadOnlyList<long>>? Stoichiometry,
    [property: JsonPropertyName("rank")] int? Rank,
    [property: JsonPropertyName("conservation_laws")] IReadOnlyList<ConservationLawDescription> ConservationLaws,
    [property: JsonPropertyName("dependent_species")] IReadOnlyList<string> DependentSpecies,
    [property: JsonPropertyName("unchanged_species")] IReadOnlyList<string> UnchangedSpecies,
    [property: JsonPropertyName("readouts")] IReadOnlyList<ReadoutDescription> Readouts,
    [property: JsonPropertyName("schedule")] IReadOnlyList<ScheduleDescription> Schedule)
{
    /// <summary>The declared time unit, or null.</summary>
    [JsonPropertyName("time_unit")]
    public string? TimeUnit { get; init; }

    /// <summary>The state-triggered change lines (<c>... whenever CONDITION</c>), as text.</summary>
    [JsonPropertyName("triggers")]
    public IReadOnlyList<string> Triggers { get; init; } = [];

    /// <summary>
    /// Why the dense N and its exact structure (rank, conservation laws) are left out, when they are: a
    /// network whose N has more entries than the exact analysis handles in bounded memory. Null otherwise.
    /// </summary>
    [JsonPropertyName("structure_note")]
    public string? StructureNote { get; init; }

    /// <summary>The cell cycle in words (growth, length, genes, split), or null for a cell that never divides.</summary>
    [JsonPropertyName("cell_cycle")]
    public string? CellCycle { get; init; }

    /// <summary>Gathers the description of a network, including the exact structure of N when it is small enough to analyse.</summary>
    public static NetworkDescription Of(ReactionNetwork network)
    {
        var n = network.Stoichiometry;
        var analysable = StoichiometricStructure.IsAnalysable(n);
        var structure = analysable ? StoichiometricStructure.Analyze(n, network.InitialCounts) : null;
        var rows = analysable
            ? Enumerable.Range(0, n.SpeciesCount).Select(i => (IReadOnlyList<long>)Enumerable.Range(0, n.ReactionCount).Select(j => n[i, j]).ToArray()).ToArray()
            : null;
        var changed = new bool[n.SpeciesCount];
        for (var j = 0; j < n.ReactionCount; j++)
            foreach (var i in n.ChangedSpecies(j)) changed[i] = true;
        string Side(IReadOnlyList<(int Species, long Coefficient)> side) => side.Count == 0
            ? "0"
            : string.Join(" + ", side.Select(t => t.Coefficient == 1 ? network.Species[t.Species] : $"{t.Coefficient} {network.Species[t.Species]}"));
        return new NetworkDescription(
            network.Name,
            network.Size,
            network.Species.Select((s, i) => new SpeciesDescription(s, network.InitialCounts[i], network.Held[i])).ToArray(),
            network.Parameters.Take(network.Cycle?.BirthSlot ?? network.Parameters.Count)
                .Select((p, i) => new ParameterDescription(p, network.InitialParameterValues[i])).ToArray(),
            network.Reactions.Select(r => new ReactionDescription(
                r.Name, $"{Side(r.Reactants)} -> {Side(r.Products)}", r.Law == Language.LawKind.Mass ? "mass" : "rate", r.LawText)).ToArray(),
            rows,
            structure?.Rank,
            structure is null ? [] : structure.ConservationLaws.Select(l => new ConservationLawDescription(
                l.Describe(network.Species),
                network.Species.Select((s, i) => (s, l.Coefficients[i])).Where(p => p.Item2 != 0).ToDictionary(p => p.s, p => p.Item2),
                l.Total)).ToArray(),
            structure is null ? [] : structure.DependentSpecies.Select(i => network.Species[i]).ToArray(),
            Enumerable.Range(0, n.SpeciesCount).Where(i => !changed[i]).Select(i => network.Species[i]).ToArray(),
            network.Readouts.Select(r => new ReadoutDescription(r.Name, r.Text, r.IsCount)).ToArray(),
            network.Schedule.Select(s => new ScheduleDescription(s.Time, s.TargetName, s.Operation switch
            {
                Language.ScheduleOperation.Set => "set",
                Language.ScheduleOperation.Add => "add",
                _ => "subtract",
            }, s.Every, double.IsPositiveInfinity(s.Until) ? null : s.Until)
            {
                Text = s.Text,
                Breaks = BrokenLaws(s, structure, network.Species),
            }).ToArray())
        {
            TimeUnit = network.Units.Time,
            Triggers = network.Triggers.Select(t => t.Text).ToArray(),
            StructureNote = analysable ? null : StoichiometricStructure.TooLargeNote(n),
            CellCycle = network.Cycle?.Describe(network),
        };
    }

    /// <summary>
    /// The conservation laws a timed change can break: a change of a species that a law counts moves that
    /// law's total, so after it the law holds with another total (or, for a repeating change, with a total
    /// that steps at each instance). A parameter change breaks none.
    /// </summary>
    private static IReadOnlyList<string> BrokenLaws(ScheduledChange change, StoichiometricStructure? structure, IReadOnlyList<string> species) =>
        change.Target != ScheduleTarget.Species || structure is null
            ? []
            : structure.ConservationLaws.Where(l => l.Coefficients[change.TargetIndex] != 0).Select(l => l.Describe(species)).ToArray();

    /// <summary>The description as indented JSON, with reactions written as in the model (<c>A -&gt; 0</c>, not
    /// <c>A -\u003E 0</c>): the default encoder escapes '&gt;' and non-ASCII letters for HTML pages, which this text
    /// never enters; JSON itself needs only quotes, backslashes and control characters escaped.</summary>
    public string ToJson() => JsonSerializer.Serialize(this, JsonText);

    private static readonly JsonSerializerOptions JsonText = new() { WriteIndented = true, Encoder = System.Text.Encodings.Web.JavaScriptEncoder.UnsafeRelaxedJsonEscaping };
}

/// <summary>A species, its initial copy number and whether it is held (no reaction changes it).</summary>
public sealed record SpeciesDescription(
    [property: JsonPropertyName("name")] string Name,
    [property: JsonPropertyName("initial")] long Initial,
    [property: JsonPropertyName("held")] bool Held = false);

/// <summary>A parameter and its value at time 0.</summary>
public sealed record ParameterDescription([property: JsonPropertyName("name")] string Name, [property: JsonPropertyName("value")] double Value);

/// <summary>A reaction: its equation, its law kind (<c>mass</c> or <c>rate</c>) and the law as text.</summary>
public sealed record ReactionDescription(
    [property: JsonPropertyName("name")] string Name,
    [property: JsonPropertyName("equation")] string Equation,
    [property: JsonPropertyName("law")] string Law,
    [property: JsonPropertyName("expression")] string Expression);

/// <summary>A conservation law as text, its coefficients by species and its conserved total.</summary>
public sealed record ConservationLawDescription(
    [property: JsonPropertyName("text")] string Text,
    [property: JsonPropertyName("coefficients")] IReadOnlyDictionary<string, long> Coefficients,
    [property: JsonPropertyName("total")] long Total);

/// <summary>A readout, its expression and whether it is a count (gets exact histograms).</summary>
public sealed record ReadoutDescription(
    [property: JsonPropertyName("name")] string Name,
    [property: JsonPropertyName("expression")] string Expression,
    [property: JsonPropertyName("is_count")] bool IsCount);

/// <summary>
/// A timed change: when (the first time, for a repeating one), what, how (<c>set</c>, <c>add</c>,
/// <c>subtract</c>), and for a repeating change its period and last time (null: once / the end of the run).
/// </summary>
public sealed record ScheduleDescription(
    [property: JsonPropertyName("time")] double Time,
    [property: JsonPropertyName("target")] string Target,
    [property: JsonPropertyName("operation")] string Operation,
    [property: JsonPropertyName("every")] double? Every = null,
    [property: JsonPropertyName("until")] double? Until = null)
{
    /// <summary>The assignment as the model writes it (<c>inducer = 20</c>, <c>protein = protein / 2</c>).</summary>
    [JsonPropertyName("text")]
    public string Text { get; init; } = "";

    /// <summary>The conservation laws (as text, with their initial totals) whose total this change moves; empty when none.</summary>
    [JsonPropertyName("breaks")]
    public IReadOnlyList<string> Breaks { get; init; } = [];
}
