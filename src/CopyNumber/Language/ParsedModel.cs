namespace CopyNumber.Language;

/// <summary>The sections of a model file.</summary>
internal enum Section
{
    /// <summary>Before the first header.</summary>
    None,
    Species,
    Parameters,
    Reactions,
    /// <summary>Timed and state-triggered changes (the first edition's <c>schedule</c> header leads here too, with an error).</summary>
    Changes,
    Readouts,
    /// <summary>The cell cycle: growth, cycle length, gene doubling, partitioning.</summary>
    Cycle,
    /// <summary>After a header that names no section; its lines are skipped.</summary>
    Unknown,
}

/// <summary>
/// What the parser read from a file, before names are checked: the declarations of every line that
/// parsed, plus what the checker needs to avoid reporting follow-on mistakes of lines that did not.
/// </summary>
internal sealed class ParsedModel
{
    /// <summary>System size Ω (1 unless a <c>size</c> line says otherwise).</summary>
    public double Size { get; set; } = 1;

    /// <summary>Species lines in file order.</summary>
    public List<SpeciesDecl> Species { get; } = [];

    /// <summary>Parameter lines in file order.</summary>
    public List<ParameterDecl> Parameters { get; } = [];

    /// <summary>Reaction lines in file order.</summary>
    public List<ReactionDecl> Reactions { get; } = [];

    /// <summary>Timed change assignments in file order (one per assignment of a change line).</summary>
    public List<ScheduleDecl> Schedule { get; } = [];

    /// <summary>State-triggered change lines in file order.</summary>
    public List<TriggerDecl> Triggers { get; } = [];

    /// <summary>The declared time unit, or null.</summary>
    public string? TimeUnit { get; set; }

    /// <summary>The declared unit of <c>size</c>, or null.</summary>
    public string? SizeUnit { get; set; }

    /// <summary>Readout lines in file order.</summary>
    public List<ReadoutDecl> Readouts { get; } = [];

    /// <summary>The <c>cycle</c> section's lines as read so far (each key once: growth, length, genes, split).</summary>
    public CycleLines Cycle { get; } = new();

    /// <summary>
    /// Names declared on lines that had a syntax error (or stood in an unknown section). Uses of them
    /// are not reported as unknown: the line's own diagnostic already says what is wrong.
    /// </summary>
    public HashSet<string> NamesOnBadLines { get; } = new(StringComparer.Ordinal);

    /// <summary>Where each section's first header stands.</summary>
    public Dictionary<Section, SourcePosition> Headers { get; } = [];

    /// <summary>Lines with a syntax error, per section, so an all-broken section is not also called empty.</summary>
    public Dictionary<Section, int> BadLines { get; } = [];

    /// <summary>The text span of every top-level expression (law, parameter value, schedule time), for precise carets.</summary>
    public Dictionary<Expr, SourcePosition> Spans { get; } = new(ReferenceEqualityComparer.Instance);
}

/// <summary>The <c>cycle</c> section's lines, collected by the parser and assembled into a <see cref="CellCycleDecl"/>.</summary>
internal sealed class CycleLines
{
    public SourcePosition? Header { get; set; }
    public string Growth { get; set; } = "exponential";
    public (Expr Mean, Expr? Cv)? Length { get; set; }
    public List<(string Name, SourcePosition Position)> Genes { get; } = [];
    public Expr? GenePhase { get; set; }
    public string Split { get; set; } = "binomial";
    public Dictionary<string, SourcePosition> Lines { get; } = new(StringComparer.Ordinal);

    /// <summary>The section, or null when the file has none or its length line is missing (reported by the checker).</summary>
    public CellCycleDecl? Build() => Header is { } at && Length is { } length
        ? new CellCycleDecl(Growth, length.Mean, length.Cv, [.. Genes], GenePhase, Split, at, new Dictionary<string, SourcePosition>(Lines))
        : null;
}
