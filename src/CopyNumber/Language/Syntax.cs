namespace CopyNumber.Language;

// The syntax tree of a .cnet model, as written. It keeps names, not indices: the network compiler
// resolves names once, after the model checker has reported every unknown or duplicate name.

/// <summary>An arithmetic expression as written in a model.</summary>
public abstract record Expr(SourcePosition Position);

/// <summary>A numeric literal such as <c>2.5</c> or <c>3e-4</c>.</summary>
public sealed record NumberExpr(double Value, SourcePosition Position) : Expr(Position);

/// <summary>A name: a species, a parameter, a readout or the reserved <c>size</c>.</summary>
public sealed record NameExpr(string Name, SourcePosition Position) : Expr(Position);

/// <summary>Unary minus.</summary>
public sealed record NegateExpr(Expr Operand, SourcePosition Position) : Expr(Position);

/// <summary>A binary operator, one of <c>+ - * / ^</c>.</summary>
public sealed record BinaryExpr(char Operator, Expr Left, Expr Right, SourcePosition Position) : Expr(Position);

/// <summary>A call of a built-in function (exp, log, sqrt, pow, min, max, abs, hill_act, hill_rep, mm, choose).</summary>
public sealed record CallExpr(string Function, IReadOnlyList<Expr> Arguments, SourcePosition Position) : Expr(Position);

/// <summary>A comparison operator of the language.</summary>
public enum Comparison
{
    /// <summary><c>&lt;</c></summary>
    Less,
    /// <summary><c>&lt;=</c></summary>
    LessOrEqual,
    /// <summary><c>&gt;</c></summary>
    Greater,
    /// <summary><c>&gt;=</c></summary>
    GreaterOrEqual,
    /// <summary><c>==</c></summary>
    Equal,
    /// <summary><c>!=</c></summary>
    NotEqual,
}

/// <summary>
/// A comparison <c>left op right</c>. Its value is a number like every other expression's: 1 when the
/// comparison holds, 0 when it does not (so it may be used as a factor, and as a condition, where any
/// value other than 0 counts as true). Its derivative is 0 everywhere.
/// </summary>
public sealed record CompareExpr(Comparison Operator, Expr Left, Expr Right, SourcePosition Position) : Expr(Position);

/// <summary>
/// <c>left and right</c> (<see cref="Conjunction"/> true) or <c>left or right</c>: 1 or 0, an operand
/// other than 0 counting as true. Both operands are evaluated (no side effects exist to skip).
/// </summary>
public sealed record LogicExpr(bool Conjunction, Expr Left, Expr Right, SourcePosition Position) : Expr(Position);

/// <summary><c>not operand</c>: 1 when the operand is 0, else 0.</summary>
public sealed record NotExpr(Expr Operand, SourcePosition Position) : Expr(Position);

/// <summary>
/// One term of a reaction side: <c>[n] species</c>, or a burst <c>burst(b) species</c> (products only):
/// a geometric number of copies on 0, 1, 2, … with mean b per firing (<paramref name="BurstMean"/>, an
/// expression of numbers, parameters and <c>size</c>; <paramref name="Coefficient"/> is then 1).
/// </summary>
public sealed record SpeciesTerm(long Coefficient, string Species, SourcePosition Position, Expr? BurstMean = null);

/// <summary>One side of a reaction arrow; an empty list is the empty side written <c>0</c>.</summary>
public sealed record ReactionSide(IReadOnlyList<SpeciesTerm> Terms, SourcePosition Position);

/// <summary>How a reaction's kinetics are given.</summary>
public enum LawKind
{
    /// <summary>Mass action with a macroscopic rate constant k (concentration units).</summary>
    Mass,
    /// <summary>A propensity written out in events per unit time, used as written by both descriptions.</summary>
    Rate,
}

/// <summary>
/// A reaction line. A reversible line (<c>L -&gt; R  law  back law</c>) carries the reverse direction's
/// own law and is expanded by the compiler into <c>name_fwd</c> and <c>name_rev</c>: reversibility lives
/// in the kinetics, never in N.
/// </summary>
/// <param name="Name">The reaction's name.</param>
/// <param name="Position">Where the name stands.</param>
/// <param name="Reactants">Left side.</param>
/// <param name="Products">Right side.</param>
/// <param name="Reversible">True for a line with a <c>back</c> clause.</param>
/// <param name="Law">The forward law's kind.</param>
/// <param name="Forward">The forward law's constant or propensity.</param>
/// <param name="Reverse">The reverse law's constant or propensity (after <c>back</c>); null for a one-way line.</param>
/// <param name="ReverseLaw">The reverse law's kind; null means the same as <paramref name="Law"/>.</param>
public sealed record ReactionDecl(
    string Name,
    SourcePosition Position,
    ReactionSide Reactants,
    ReactionSide Products,
    bool Reversible,
    LawKind Law,
    Expr Forward,
    Expr? Reverse,
    LawKind? ReverseLaw = null)
{
    /// <summary>The reverse law's kind (the forward one's unless the <c>back</c> clause names another).</summary>
    public LawKind BackLaw => ReverseLaw ?? Law;
}

/// <summary>A species, its initial amount and whether it is fixed.</summary>
/// <param name="Name">The species' name.</param>
/// <param name="InitialCount">The initial copy number (the amount rounded to the nearest integer when it is not whole).</param>
/// <param name="Position">Where the name stands.</param>
/// <param name="Fixed">
/// True for a species marked <c>fixed</c>: no reaction changes its count (its entries in N are dropped),
/// laws may read it, and changes (timed or triggered) may still set it.
/// </param>
/// <param name="FractionalAmount">
/// The initial amount as written when it is not a whole number (only the rate equations and the
/// expansions may use such a model); null for a whole number.
/// </param>
public sealed record SpeciesDecl(string Name, long InitialCount, SourcePosition Position, bool Fixed = false, double? FractionalAmount = null)
{
    /// <summary>The initial amount as written: the fractional amount, or the count.</summary>
    public double InitialAmount => FractionalAmount ?? InitialCount;
}

/// <summary>A parameter defined by an expression of numbers, earlier parameters and <c>size</c>.</summary>
public sealed record ParameterDecl(string Name, Expr Value, SourcePosition Position, ParameterVariation? Varies = null);

/// <summary>
/// <c>k = 6  varies gamma cv 0.3</c>: the parameter is drawn per replicate (per draw of a nested design) from
/// the named law with mean the parameter's value and coefficient of variation <paramref name="Cv"/>.
/// </summary>
/// <param name="Law">One of <see cref="VariationLaws"/>.</param>
/// <param name="Cv">The coefficient of variation, an expression of numbers, earlier parameters and size.</param>
/// <param name="Position">Where the law's name stands.</param>
public sealed record ParameterVariation(string Law, Expr Cv, SourcePosition Position)
{
    /// <summary>The laws a parameter may vary by: lognormal, gamma, uniform, and normal truncated to positive values.</summary>
    public static IReadOnlyList<string> VariationLaws { get; } = ["lognormal", "gamma", "uniform", "normal"];
}

/// <summary>What a schedule line does to its target.</summary>
public enum ScheduleOperation
{
    /// <summary><c>target = value</c></summary>
    Set,
    /// <summary><c>species += value</c></summary>
    Add,
    /// <summary><c>species -= value</c></summary>
    Subtract,
}

/// <summary>
/// One assignment of a timed change line, <c>target op value  at time T</c> or
/// <c>target op value  every P [from T] [until U]</c>; a line with several assignments (separated by
/// commas) gives one declaration per assignment, in order, all with the same timing.
/// </summary>
/// <param name="Time">When (for a repeating change, the first time: the <c>from</c> value, or the period when there is no <c>from</c>).</param>
/// <param name="Target">A species or a parameter.</param>
/// <param name="TargetPosition">Where the target stands.</param>
/// <param name="Operation">Set, add or subtract.</param>
/// <param name="Value">The new value (or the amount added or subtracted).</param>
/// <param name="Position">Where the line starts.</param>
/// <param name="Every">The period of a repeating change; null for a change that happens once.</param>
/// <param name="Until">The last time a repeating change may happen (inclusive); null for the end of the run.</param>
public sealed record ScheduleDecl(Expr Time, string Target, SourcePosition TargetPosition, ScheduleOperation Operation, Expr Value, SourcePosition Position,
    Expr? Every = null, Expr? Until = null);

/// <summary>One assignment <c>target op value</c> of a state-triggered change.</summary>
public sealed record AssignmentDecl(string Target, SourcePosition TargetPosition, ScheduleOperation Operation, Expr Value);

/// <summary>
/// A state-triggered change, <c>assignments  whenever condition</c>: the assignments apply, in order,
/// when the condition turns from false to true.
/// </summary>
/// <param name="Assignments">The changes, in order.</param>
/// <param name="Condition">The condition, an expression of species, parameters, <c>size</c> and numbers.</param>
/// <param name="Position">Where the line starts.</param>
public sealed record TriggerDecl(IReadOnlyList<AssignmentDecl> Assignments, Expr Condition, SourcePosition Position);

/// <summary>A derived quantity reported beside the species, an expression of species.</summary>
public sealed record ReadoutDecl(string Name, Expr Value, SourcePosition Position);

/// <summary>A whole parsed model file.</summary>
/// <param name="File">The file name, for messages.</param>
/// <param name="Size">The system size Ω as written (1 when the file has no <c>size</c> line).</param>
/// <param name="Species">Species lines in file order.</param>
/// <param name="Parameters">Parameter lines in file order.</param>
/// <param name="Reactions">Reaction lines in file order.</param>
/// <param name="Schedule">Schedule lines in file order.</param>
/// <param name="Readouts">Readout lines in file order.</param>
/// <param name="Triggers">State-triggered change lines in file order (null for none).</param>
/// <param name="TimeUnit">The declared time unit (<c>time unit minute</c>), or null when none is declared.</param>
/// <param name="SizeUnit">The declared unit of <c>size</c> (<c>size 2 litre</c>), or null.</param>
/// <param name="Cycle">The <c>cycle</c> section (a cell that grows and divides), or null when the model has none.</param>
public sealed record ModelSyntax(
    string File,
    double Size,
    IReadOnlyList<SpeciesDecl> Species,
    IReadOnlyList<ParameterDecl> Parameters,
    IReadOnlyList<ReactionDecl> Reactions,
    IReadOnlyList<ScheduleDecl> Schedule,
    IReadOnlyList<ReadoutDecl> Readouts,
    IReadOnlyList<TriggerDecl>? Triggers = null,
    string? TimeUnit = null,
    string? SizeUnit = null,
    CellCycleDecl? Cycle = null)
{
    /// <summary>State-triggered change lines (empty when there are none).</summary>
    public IReadOnlyList<TriggerDecl> TriggerLines => Triggers ?? [];
}

/// <summary>
/// The <c>cycle</c> section: a cell whose volume grows between divisions, whose gene copies double at a
/// phase of the cycle and whose molecules are split between two daughters at division (one lineage followed).
/// </summary>
/// <param name="Growth"><c>exponential</c> (V = V₀·2^(a/T)) or <c>linear</c> (V = V₀·(1 + a/T)), a the cell's age, T its cycle length.</param>
/// <param name="Length">The mean cycle length, in the model's time unit (an expression of numbers, parameters and <c>size</c>).</param>
/// <param name="LengthCv">The cycle length's coefficient of variation (gamma law); null for a fixed length.</param>
/// <param name="Genes">The gene species whose copies double at <paramref name="GenePhase"/>, with where each is named.</param>
/// <param name="GenePhase">The fraction of the cycle at which the genes double, in [0, 1); null when no gene is named.</param>
/// <param name="Split"><c>binomial</c> (each molecule to either daughter with probability ½) or <c>halves</c> (⌊n/2⌋ or ⌈n/2⌉, ½ each).</param>
/// <param name="Position">The section header.</param>
/// <param name="Lines">Where each kind of line stands (growth, length, genes, split), for messages.</param>
public sealed record CellCycleDecl(
    string Growth,
    Expr Length,
    Expr? LengthCv,
    IReadOnlyList<(string Name, SourcePosition Position)> Genes,
    Expr? GenePhase,
    string Split,
    SourcePosition Position,
    IReadOnlyDictionary<string, SourcePosition> Lines);
