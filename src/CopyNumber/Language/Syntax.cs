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

/// <summary>A call of a built-in function (exp, log, sqrt, pow, min, max, abs, hill_act, hill_rep, mm).</summary>
public sealed record CallExpr(string Function, IReadOnlyList<Expr> Arguments, SourcePosition Position) : Expr(Position);

/// <summary>One term of a reaction side: <c>[n] species</c>.</summary>
public sealed record SpeciesTerm(long Coefficient, string Species, SourcePosition Position);

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
/// A reaction line. A reversible line (<c>&lt;-&gt;</c>) carries two constants and is expanded by the
/// compiler into <c>name_fwd</c> and <c>name_rev</c>: reversibility lives in the kinetics, never in N.
/// </summary>
public sealed record ReactionDecl(
    string Name,
    SourcePosition Position,
    ReactionSide Reactants,
    ReactionSide Products,
    bool Reversible,
    LawKind Law,
    Expr Forward,
    Expr? Reverse);

/// <summary>A species and its initial copy number.</summary>
public sealed record SpeciesDecl(string Name, long InitialCount, SourcePosition Position);

/// <summary>A parameter defined by an expression of numbers, earlier parameters and <c>size</c>.</summary>
public sealed record ParameterDecl(string Name, Expr Value, SourcePosition Position);

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

/// <summary><c>at time: target op value</c>; the target is a species or a parameter.</summary>
public sealed record ScheduleDecl(Expr Time, string Target, SourcePosition TargetPosition, ScheduleOperation Operation, Expr Value, SourcePosition Position);

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
public sealed record ModelSyntax(
    string File,
    double Size,
    IReadOnlyList<SpeciesDecl> Species,
    IReadOnlyList<ParameterDecl> Parameters,
    IReadOnlyList<ReactionDecl> Reactions,
    IReadOnlyList<ScheduleDecl> Schedule,
    IReadOnlyList<ReadoutDecl> Readouts);
