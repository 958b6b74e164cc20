using CopyNumber.Kinetics;

namespace CopyNumber.Network;

/// <summary>
/// A compiled reaction network: topology (N) kept apart from kinetics (propensities and rate laws),
/// as in dx/dt = N·v. Immutable and shared by every simulator thread.
/// </summary>
public sealed class ReactionNetwork
{
    /// <summary>Creates a network; normally done by the network compiler.</summary>
    /// <remarks>The optional arguments default to: initial amounts equal to the counts, no triggers, no declared units, no held species.</remarks>
    public ReactionNetwork(
        string name,
        string sourceFile,
        double size,
        IReadOnlyList<string> species,
        IReadOnlyList<long> initialCounts,
        IReadOnlyList<string> parameters,
        IReadOnlyList<double> initialParameterValues,
        IReadOnlyList<Reaction> reactions,
        Stoichiometry stoichiometry,
        DependencyGraph dependencies,
        Propensities propensities,
        RateEquations rateEquations,
        IReadOnlyList<Readout> readouts,
        IReadOnlyList<ScheduledChange> schedule,
        IReadOnlyList<double>? initialAmounts = null,
        IReadOnlyList<StateTrigger>? triggers = null,
        ModelUnits? units = null,
        IReadOnlyList<bool>? held = null,
        IReadOnlyList<Language.SourcePosition>? speciesPositions = null,
        TimeDependence? timeDependence = null,
        BurstProducts? bursts = null,
        ParameterVariability? variability = null,
        CellCycle? cycle = null)
    {
        Name = name;
        SourceFile = sourceFile;
        Size = size;
        Species = species.ToArray();
        InitialCounts = initialCounts.ToArray();
        Parameters = parameters.ToArray();
        InitialParameterValues = initialParameterValues.ToArray();
        Reactions = reactions.ToArray();
        Stoichiometry = stoichiometry;
        Dependencies = dependencies;
        Propensities = propensities;
        RateEquations = rateEquations;
        Readouts = readouts.ToArray();
        Schedule = schedule.OrderBy(s => s.Time).ThenBy(s => s.Order).ToArray(); // stable: list order where Order ties
        InitialAmounts = initialAmounts?.ToArray() ?? InitialCounts.Select(c => (double)c).ToArray();
        Triggers = triggers?.ToArray() ?? [];
        Units = units ?? ModelUnits.None;
        Held = held?.ToArray() ?? new bool[Species.Count];
        SpeciesPositions = speciesPositions?.ToArray() ?? [];
        TimeDependence = timeDependence ?? TimeDependence.None(Reactions.Count);
        Bursts = bursts ?? BurstProducts.None(Reactions.Count);
        Variability = variability ?? ParameterVariability.None;
        Cycle = cycle;
    }

    /// <summary>The cell cycle (growth, gene doubling, division), or null for a cell of fixed size that never divides.</summary>
    public CellCycle? Cycle { get; private set; }

    /// <summary>The same network with cells that split by <paramref name="split"/> at division; it must have a cycle.</summary>
    /// <remarks>Everything else is shared: the compiled laws read the cycle only through its hidden parameters.</remarks>
    public ReactionNetwork WithSplit(CellSplit split)
    {
        var cycle = Cycle ?? throw new InvalidOperationException("the network has no cell cycle");
        var copy = (ReactionNetwork)MemberwiseClone();
        copy.Cycle = cycle.WithSplit(split);
        return copy;
    }

    /// <summary>Parameters drawn per replicate group from a named law (none unless a parameter line says <c>varies</c>).</summary>
    public ParameterVariability Variability { get; }

    /// <summary>Products made in bursts of random size (none unless a reaction has a <c>burst(b)</c> product).</summary>
    public BurstProducts Bursts { get; }

    /// <summary>Which rate laws read <c>time</c> (none unless some law does).</summary>
    public TimeDependence TimeDependence { get; }

    /// <summary>
    /// The slot of a parameter array, after the declared parameters, from which compiled laws read
    /// <c>time</c>; arrays handed to laws have <see cref="Parameters"/>.Count + 1 entries
    /// (<see cref="ParameterValuesWithTime"/>).
    /// </summary>
    public int TimeSlot => Parameters.Count;

    /// <summary>A fresh parameter array for compiled laws: the initial values, then the time slot set to <paramref name="time"/>.</summary>
    public double[] ParameterValuesWithTime(double time = 0.0) => [.. InitialParameterValues, time];

    /// <summary>
    /// Initial amounts as declared: equal to <see cref="InitialCounts"/> except where a species starts at a
    /// non-integer amount, which only the rate equations and the expansions accept
    /// (<see cref="ModelSupport.StochasticProblems"/>). The deterministic methods start from these.
    /// </summary>
    public IReadOnlyList<double> InitialAmounts { get; }

    /// <summary>State-triggered changes, in file order (which methods carry them out: <see cref="ModelSupport"/>).</summary>
    public IReadOnlyList<StateTrigger> Triggers { get; }

    /// <summary>The declared units of time and of <c>size</c> (each may be undeclared).</summary>
    public ModelUnits Units { get; }

    /// <summary>
    /// Per species, whether it is held: no reaction changes its count (its entries in N are dropped, as for
    /// an SBML boundary species) while laws may read it and changes may set it.
    /// </summary>
    public IReadOnlyList<bool> Held { get; }

    /// <summary>Where each species is declared in the model file (empty for a network built without a file).</summary>
    public IReadOnlyList<Language.SourcePosition> SpeciesPositions { get; }

    /// <summary>The model's name (its file name without extension).</summary>
    public string Name { get; }

    /// <summary>The model file as given.</summary>
    public string SourceFile { get; }

    /// <summary>System size Ω; concentration = count / Ω.</summary>
    public double Size { get; }

    /// <summary>Species names, in declaration order; every species-indexed array follows this order.</summary>
    public IReadOnlyList<string> Species { get; }

    /// <summary>Initial copy numbers.</summary>
    public IReadOnlyList<long> InitialCounts { get; }

    /// <summary>Parameter names, in declaration order.</summary>
    public IReadOnlyList<string> Parameters { get; }

    /// <summary>Parameter values at time 0.</summary>
    public IReadOnlyList<double> InitialParameterValues { get; }

    /// <summary>Reactions (columns of N), reversible lines split into two.</summary>
    public IReadOnlyList<Reaction> Reactions { get; }

    /// <summary>N, dense and sparse.</summary>
    public Stoichiometry Stoichiometry { get; }

    /// <summary>Which propensities change when each reaction fires.</summary>
    public DependencyGraph Dependencies { get; }

    /// <summary>Stochastic propensities a(x).</summary>
    public Propensities Propensities { get; }

    /// <summary>Deterministic rates v(x), N·v and the exact Jacobian.</summary>
    public RateEquations RateEquations { get; }

    /// <summary>Derived quantities.</summary>
    public IReadOnlyList<Readout> Readouts { get; }

    /// <summary>Timed changes, sorted by time (file order within a time).</summary>
    public IReadOnlyList<ScheduledChange> Schedule { get; }

    /// <summary>Index of a species by name, or −1.</summary>
    public int SpeciesIndex(string name) => IndexOf(Species, name);

    /// <summary>Index of a parameter by name, or −1.</summary>
    public int ParameterIndex(string name) => IndexOf(Parameters, name);

    private static int IndexOf(IReadOnlyList<string> names, string name)
    {
        for (var i = 0; i < names.Count; i++) if (names[i] == name) return i;
        return -1;
    }
}
