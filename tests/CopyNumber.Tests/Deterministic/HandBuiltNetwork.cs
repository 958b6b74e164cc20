using CopyNumber.Kinetics;
using CopyNumber.Language;
using CopyNumber.Network;

namespace CopyNumber.Tests.Deterministic;

/// <summary>
/// Assembles a <see cref="ReactionNetwork"/> directly from its parts (N, propensities, rate equations),
/// so the rate-equation solver can be tested without the network compiler.
/// </summary>
internal sealed class HandBuiltNetwork(double size = 1)
{
    private readonly List<string> _species = new();
    private readonly List<long> _counts = new();
    private readonly List<string> _parameters = new();
    private readonly List<double> _values = new();
    private readonly List<Reaction> _reactions = new();
    private readonly List<(int Species, long Order)[]> _reactants = new();
    private readonly List<StateLaw?> _constants = new();
    private readonly List<CountLaw?> _countLaws = new();
    private readonly List<StateLaw?> _stateLaws = new();
    private readonly List<(int Species, StateLaw Derivative)[]> _derivatives = new();
    private readonly List<Readout> _readouts = new();
    private readonly List<ScheduledChange> _schedule = new();

    public int Species(string name, long count)
    {
        _species.Add(name);
        _counts.Add(count);
        return _species.Count - 1;
    }

    public int Parameter(string name, double value)
    {
        _parameters.Add(name);
        _values.Add(value);
        return _parameters.Count - 1;
    }

    /// <summary>Mass action with macroscopic constant k = parameter <paramref name="constant"/>.</summary>
    public void MassAction(string name, (int Species, long Order)[] reactants, (int Species, long Order)[] products, int constant)
    {
        _reactions.Add(new Reaction(name, reactants, products, LawKind.Mass, _parameters[constant]));
        _reactants.Add(reactants);
        _constants.Add((_, p) => p[constant]);
        _countLaws.Add(null);
        _stateLaws.Add(null);
        _derivatives.Add([]);
    }

    /// <summary>A written-out rate v(x) with its partial derivatives.</summary>
    public void Rate(string name, (int Species, long Order)[] reactants, (int Species, long Order)[] products,
        StateLaw rate, params (int Species, StateLaw Derivative)[] derivatives)
    {
        _reactions.Add(new Reaction(name, reactants, products, LawKind.Rate, "written out"));
        _reactants.Add(reactants);
        _constants.Add(null);
        _countLaws.Add((counts, p) => rate(counts.Select(c => (double)c).ToArray(), p));
        _stateLaws.Add(rate);
        _derivatives.Add(derivatives);
    }

    public void Readout(string name, StateLaw onState) =>
        _readouts.Add(new Readout(name, name, false, (counts, p) => onState(counts.Select(c => (double)c).ToArray(), p), onState));

    public void ChangeSpecies(double time, int species, ScheduleOperation operation, StateLaw value) =>
        _schedule.Add(new ScheduledChange(time, ScheduleTarget.Species, species, _species[species], operation,
            (counts, p) => value(counts.Select(c => (double)c).ToArray(), p), value));

    public void ChangeParameter(double time, int parameter, StateLaw value) =>
        _schedule.Add(new ScheduledChange(time, ScheduleTarget.Parameter, parameter, _parameters[parameter], ScheduleOperation.Set,
            (counts, p) => value(counts.Select(c => (double)c).ToArray(), p), value));

    public ReactionNetwork Build()
    {
        var dense = new long[_species.Count, _reactions.Count];
        for (var j = 0; j < _reactions.Count; j++)
        {
            foreach (var (s, c) in _reactions[j].Reactants) dense[s, j] -= c;
            foreach (var (s, c) in _reactions[j].Products) dense[s, j] += c;
        }
        var stoichiometry = new Stoichiometry(dense);
        var read = _reactions.Select((r, j) => (IReadOnlyCollection<int>)(_stateLaws[j] is null
            ? r.Reactants.Select(x => x.Species).ToArray()
            : Enumerable.Range(0, _species.Count).ToArray())).ToList();
        var propensities = new Propensities(size,
            _reactants.Select(r => (IReadOnlyList<(int, long)>)r).ToList(), _constants, _countLaws);
        var rateEquations = new RateEquations(stoichiometry, propensities, _stateLaws,
            _derivatives.Select(d => (IReadOnlyList<(int, StateLaw)>)d).ToList());
        return new ReactionNetwork("hand-built", "hand-built.cnet", size, _species, _counts, _parameters, _values,
            _reactions, stoichiometry, new DependencyGraph(stoichiometry, read), propensities, rateEquations, _readouts, _schedule);
    }
}
