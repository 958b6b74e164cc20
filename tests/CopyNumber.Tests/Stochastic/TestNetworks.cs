using System.Globalization;
using CopyNumber.Kinetics;
using CopyNumber.Language;
using CopyNumber.Network;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// Builds compiled networks directly from a compact description, without the parser or the network
/// compiler: species with initial counts, parameters, mass-action reactions written as
/// <c>("2 P", "D", "k")</c> (sides are <c>+</c>-separated terms, <c>""</c> is the empty side; the constant is
/// a parameter name or a number) and rate-law reactions with a hand-written <see cref="CountLaw"/>.
/// Test networks carry no rate equations for rate laws (the simulators never read them).
/// </summary>
internal sealed class TestNetwork
{
    private readonly List<(string Name, long Initial)> _species = [];
    private readonly List<(string Name, double Value)> _parameters = [];
    private readonly List<ReactionSpec> _reactions = [];
    private readonly List<(double Time, string Target, ScheduleOperation Operation, CountLaw Value)> _schedule = [];

    private sealed record ReactionSpec(string Name, string Reactants, string Products, string? Constant, CountLaw? Law, string[] Reads);

    public TestNetwork Species(string name, long initial)
    {
        _species.Add((name, initial));
        return this;
    }

    public TestNetwork Parameter(string name, double value)
    {
        _parameters.Add((name, value));
        return this;
    }

    /// <summary>A mass-action reaction; <paramref name="constant"/> is a parameter name or a number (k, macroscopic).</summary>
    public TestNetwork Mass(string name, string reactants, string products, string constant)
    {
        _reactions.Add(new ReactionSpec(name, reactants, products, constant, null, []));
        return this;
    }

    /// <summary>A rate-law reaction: N from the two sides, the propensity from <paramref name="law"/>, which reads <paramref name="reads"/>.</summary>
    public TestNetwork Rate(string name, string consumed, string products, CountLaw law, params string[] reads)
    {
        _reactions.Add(new ReactionSpec(name, consumed, products, null, law, reads));
        return this;
    }

    /// <summary>A schedule line: at <paramref name="time"/>, species or parameter <paramref name="target"/> op value.</summary>
    public TestNetwork At(double time, string target, ScheduleOperation operation, CountLaw value)
    {
        _schedule.Add((time, target, operation, value));
        return this;
    }

    public TestNetwork At(double time, string target, ScheduleOperation operation, double value) =>
        At(time, target, operation, (_, _) => value);

    public ReactionNetwork Build(double size = 1.0)
    {
        var speciesNames = _species.Select(s => s.Name).ToList();
        var parameterNames = _parameters.Select(p => p.Name).ToList();
        int SpeciesIndex(string name) => speciesNames.IndexOf(name) is var i and >= 0 ? i : throw new ArgumentException($"unknown species {name}");

        var m = _reactions.Count;
        var dense = new long[speciesNames.Count, m];
        var reactantLists = new List<IReadOnlyList<(int, long)>>();
        var constants = new List<StateLaw?>();
        var rateLaws = new List<CountLaw?>();
        var reads = new List<IReadOnlyCollection<int>>();
        var reactions = new List<Reaction>();
        for (var j = 0; j < m; j++)
        {
            var spec = _reactions[j];
            var left = Side(spec.Reactants, SpeciesIndex);
            var right = Side(spec.Products, SpeciesIndex);
            foreach (var (i, c) in left) dense[i, j] -= c;
            foreach (var (i, c) in right) dense[i, j] += c;
            if (spec.Law is null)
            {
                reactantLists.Add(left);
                constants.Add(ConstantLaw(spec.Constant!, parameterNames));
                rateLaws.Add(null);
                reads.Add(left.Select(r => r.Species).ToArray());
                reactions.Add(new Reaction(spec.Name, left, right, LawKind.Mass, spec.Constant!));
            }
            else
            {
                reactantLists.Add([]);
                constants.Add(null);
                rateLaws.Add(spec.Law);
                reads.Add(spec.Reads.Select(SpeciesIndex).ToArray());
                reactions.Add(new Reaction(spec.Name, left, right, LawKind.Rate, "test rate law"));
            }
        }

        var stoichiometry = new Stoichiometry(dense);
        var propensities = new Propensities(size, reactantLists, constants, rateLaws);
        var rateEquations = new RateEquations(stoichiometry, propensities, new StateLaw?[m], Enumerable.Range(0, m).Select(_ => (IReadOnlyList<(int, StateLaw)>)[]).ToList());
        var schedule = _schedule.Select(s =>
        {
            var species = speciesNames.IndexOf(s.Target);
            var target = species >= 0 ? ScheduleTarget.Species : ScheduleTarget.Parameter;
            var index = species >= 0 ? species : parameterNames.IndexOf(s.Target);
            if (index < 0) throw new ArgumentException($"unknown schedule target {s.Target}");
            return new ScheduledChange(s.Time, target, index, s.Target, s.Operation, s.Value, (_, _) => throw new NotSupportedException("test networks have no rate-equation schedule"));
        }).ToList();
        return new ReactionNetwork(
            "test", "test.cnet", size, speciesNames, _species.Select(s => s.Initial).ToList(),
            parameterNames, _parameters.Select(p => p.Value).ToList(), reactions, stoichiometry,
            new DependencyGraph(stoichiometry, reads), propensities, rateEquations, [], schedule);
    }

    private static List<(int Species, long Coefficient)> Side(string text, Func<string, int> index)
    {
        var terms = new List<(int, long)>();
        foreach (var raw in text.Split('+', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
        {
            var parts = raw.Split(' ', StringSplitOptions.RemoveEmptyEntries);
            var (coefficient, name) = parts.Length == 2 ? (long.Parse(parts[0], CultureInfo.InvariantCulture), parts[1]) : (1L, parts[0]);
            var i = index(name);
            var existing = terms.FindIndex(t => t.Item1 == i);
            if (existing >= 0) terms[existing] = (i, terms[existing].Item2 + coefficient);
            else terms.Add((i, coefficient));
        }
        return terms;
    }

    private static StateLaw ConstantLaw(string constant, List<string> parameters)
    {
        if (double.TryParse(constant, NumberStyles.Float, CultureInfo.InvariantCulture, out var value)) return (_, _) => value;
        var p = parameters.IndexOf(constant);
        if (p < 0) throw new ArgumentException($"unknown parameter {constant}");
        return (_, values) => values[p];
    }
}

/// <summary>The small models the tests use, each with the source of its exact solution in the test that uses it.</summary>
internal static class TestNetworks
{
    /// <summary>0 → X at rate α, X → 0 at rate μ·x.</summary>
    public static ReactionNetwork ImmigrationDeath(double alpha, double mu, long x0 = 0) =>
        new TestNetwork().Species("X", x0).Parameter("alpha", alpha).Parameter("mu", mu)
            .Mass("immigration", "", "X", "alpha").Mass("death", "X", "", "mu").Build();

    /// <summary>X → 2X at rate λ·x, X → 0 at rate μ·x.</summary>
    public static ReactionNetwork BirthDeath(double lambda, double mu, long x0) =>
        new TestNetwork().Species("X", x0).Parameter("lambda", lambda).Parameter("mu", mu)
            .Mass("birth", "X", "2 X", "lambda").Mass("death", "X", "", "mu").Build();

    /// <summary>A → B at rate c1·a, B → A at rate c2·b.</summary>
    public static ReactionNetwork Isomerisation(long a0, long b0, double c1, double c2) =>
        new TestNetwork().Species("A", a0).Species("B", b0)
            .Mass("forward", "A", "B", c1.ToString("R", CultureInfo.InvariantCulture))
            .Mass("backward", "B", "A", c2.ToString("R", CultureInfo.InvariantCulture)).Build();

    /// <summary>2P → D at rate c1·p(p−1) (Ω = 1), D → 2P at rate c2·d.</summary>
    public static ReactionNetwork Dimerisation(long p0, double c1, double c2) =>
        new TestNetwork().Species("P", p0).Species("D", 0).Parameter("c1", c1).Parameter("c2", c2)
            .Mass("dimerise", "2 P", "D", "c1").Mass("dissociate", "D", "2 P", "c2").Build();

    /// <summary>
    /// The 4-species, 6-reaction gene model: promoter off ⇄ on, transcription from the on promoter,
    /// translation, mRNA and protein decay.
    /// </summary>
    public static ReactionNetwork Gene(double kOn = 0.5, double kOff = 0.5, double kM = 5, double kP = 2, double dM = 1, double dP = 0.5) =>
        new TestNetwork().Species("off", 1).Species("on", 0).Species("mRNA", 0).Species("protein", 0)
            .Parameter("kOn", kOn).Parameter("kOff", kOff).Parameter("kM", kM).Parameter("kP", kP).Parameter("dM", dM).Parameter("dP", dP)
            .Mass("activate", "off", "on", "kOn").Mass("deactivate", "on", "off", "kOff")
            .Mass("transcribe", "on", "on + mRNA", "kM").Mass("translate", "mRNA", "mRNA + protein", "kP")
            .Mass("mRNA_decay", "mRNA", "", "dM").Mass("protein_decay", "protein", "", "dP").Build();
}
