using CopyNumber.Kinetics;
using CopyNumber.Network;

namespace CopyNumber.Stochastic;

/// <summary>
/// The leap size τ' of Cao, Gillespie &amp; Petzold (2006, J. Chem. Phys. 124:044109, eq. 33): the largest τ
/// for which the expected change and the standard deviation of the change of every reactant species,
/// driven by the non-critical reactions, stay within max(ε·x_i/g_i, 1):
/// τ' = min_i { max(ε x_i/g_i, 1)/|μ_i|, max(ε x_i/g_i, 1)²/σ_i² }, μ_i = Σ_j ν_ij a_j, σ_i² = Σ_j ν_ij² a_j.
/// </summary>
/// <remarks>
/// g_i follows the paper's highest-order-reaction rule: for a reaction of total order m needing ν
/// molecules of species i, g = m when ν = 1, g = 2 + 1/(x−1) for a homodimer (m = ν = 2),
/// (3/2)(2 + 1/(x−1)) for m = 3, ν = 2, and 3 + 1/(x−1) + 2/(x−2) for m = ν = 3 — all the case
/// g = (m/ν)·Σ_{q&lt;ν} x/(x−q), which is used for any order. Where species i is a reactant of several
/// reactions g_i is the largest of their factors: equal to the paper's rule when the highest-order
/// reaction decides, never smaller. Rate laws have no reactant list; each species a rate law reads is
/// treated as a first-order reactant (g ≥ 1). That bounds the relative change of the species, not of a
/// steep law such as a Hill function of high coefficient, whose propensity can change by up to its
/// coefficient times as much.
/// <para>For the trapezoidal leap (<see cref="LeapFormulaRule"/>) the drift μ_i may leave out the reversible
/// pairs in partial equilibrium, |a_j − a_j'| ≤ δ·min(a_j, a_j') with δ = 0.05, whose net drift is the
/// restoring pull on the fluctuations of a fast mode, not a transient (Cao, Gillespie &amp; Petzold 2007,
/// J. Chem. Phys. 126:224101; quoted from memory); their noise stays in σ_i². Counting that pull would make
/// the leap shorter the further a fast mode has strayed, so the leap would damp large excursions more than
/// small ones and the trapezoidal leap would lose its exact stationary variance (measured: the stiff test
/// network's A had Fano factor 0.94 at ε = 0.03 and 0.70 at ε = 0.1 with the pull counted).</para>
/// </remarks>
internal sealed class LeapStepSize
{
    private readonly ReactionEffects _effects;
    private readonly double _epsilon;
    private readonly int[] _species;        // I_rs: species some propensity reads
    private readonly int[] _formStart;      // per I_rs entry, its (order, multiplicity) forms
    private readonly (int Order, int Multiplicity)[] _forms;
    private readonly double[] _mean;        // μ_i, per species
    private readonly double[] _variance;    // σ_i², per species
    private readonly int[] _reverse;        // per reaction, a reaction with the opposite change, or −1

    /// <summary>The relative imbalance δ below which a reversible pair counts as in partial equilibrium.</summary>
    public const double PartialEquilibrium = 0.05;

    public LeapStepSize(ReactionNetwork network, ReactionEffects effects, double epsilon)
    {
        _effects = effects;
        _epsilon = epsilon;
        var propensities = network.Propensities;
        var speciesCount = network.Stoichiometry.SpeciesCount;
        var species = new List<int>();
        var formStart = new List<int>();
        var forms = new List<(int, int)>();
        for (var i = 0; i < speciesCount; i++)
        {
            var readers = network.Dependencies.Readers(i);
            if (readers.Length == 0) continue;
            var own = new SortedSet<(int, int)>();
            foreach (var j in readers)
            {
                var multiplicity = 1;
                if (propensities.Form(j) != PropensityForm.RateLaw)
                    foreach (var (reactant, order) in propensities.Reactants(j))
                        if (reactant == i) multiplicity = (int)order;
                var total = propensities.Form(j) == PropensityForm.RateLaw ? 1 : Math.Max(propensities.Order(j), multiplicity);
                own.Add((total, multiplicity));
            }
            species.Add(i);
            formStart.Add(forms.Count);
            forms.AddRange(own);
        }
        formStart.Add(forms.Count);
        _species = species.ToArray();
        _formStart = formStart.ToArray();
        _forms = forms.ToArray();
        _mean = new double[speciesCount];
        _variance = new double[speciesCount];
        _reverse = ReversePartners(network.Stoichiometry);
        HasReversiblePairs = _reverse.Any(r => r >= 0);
    }

    /// <summary>Whether some reaction has a reverse; without one, skipping partial equilibria changes nothing.</summary>
    public bool HasReversiblePairs { get; }

    /// <summary>Per reaction j, some reaction j' whose column of N is −ν_j (its reverse); −1 if none.</summary>
    private static int[] ReversePartners(Stoichiometry n)
    {
        var reverse = Enumerable.Repeat(-1, n.ReactionCount).ToArray();
        var byColumn = new Dictionary<string, int>();
        string Key(int j, long sign) =>
            string.Join(",", n.ChangedSpecies(j).ToArray().Zip(n.Changes(j).ToArray()).OrderBy(p => p.First).Select(p => $"{p.First}:{sign * p.Second}"));
        for (var j = 0; j < n.ReactionCount; j++)
        {
            if (n.ChangedSpecies(j).Length == 0) continue;
            if (byColumn.TryGetValue(Key(j, -1), out var partner) && reverse[partner] < 0)
            {
                reverse[j] = partner;
                reverse[partner] = j;
            }
            else byColumn.TryAdd(Key(j, 1), j);
        }
        return reverse;
    }

    /// <summary>τ' for the current state; +∞ when no bound applies (no non-critical reaction changes a read species).</summary>
    /// <param name="counts">The state.</param>
    /// <param name="propensities">a_j at the state.</param>
    /// <param name="critical">The critical reactions, left out of μ and σ².</param>
    /// <param name="skipEquilibrium">Leave the reversible pairs in partial equilibrium out of μ (trapezoidal leaps only).</param>
    public double Select(long[] counts, double[] propensities, bool[] critical, bool skipEquilibrium = false)
    {
        Array.Clear(_mean);
        Array.Clear(_variance);
        var start = _effects.ChangeStart;
        var changed = _effects.ChangeSpecies;
        var amount = _effects.ChangeAmount;
        for (var j = 0; j < propensities.Length; j++)
        {
            var a = propensities[j];
            if (critical[j] || !(a > 0.0)) continue;
            var drifts = !skipEquilibrium || !InPartialEquilibrium(j, propensities, critical);
            for (var e = start[j]; e < start[j + 1]; e++)
            {
                double nu = amount[e];
                if (drifts) _mean[changed[e]] += nu * a;
                _variance[changed[e]] += nu * nu * a;
            }
        }

        var tau = double.PositiveInfinity;
        for (var s = 0; s < _species.Length; s++)
        {
            var i = _species[s];
            var mean = Math.Abs(_mean[i]);
            var variance = _variance[i];
            if (!(mean > 0.0) && !(variance > 0.0)) continue;
            var x = counts[i];
            var g = 0.0;
            for (var f = _formStart[s]; f < _formStart[s + 1]; f++)
                g = Math.Max(g, OrderFactor(x, _forms[f].Order, _forms[f].Multiplicity));
            var bound = Math.Max(_epsilon * x / g, 1.0);
            if (mean > 0.0) tau = Math.Min(tau, bound / mean);
            if (variance > 0.0) tau = Math.Min(tau, bound * bound / variance);
        }
        return tau;
    }

    private bool InPartialEquilibrium(int reaction, double[] propensities, bool[] critical)
    {
        var partner = _reverse[reaction];
        if (partner < 0 || critical[partner]) return false;
        var a = propensities[reaction];
        var b = propensities[partner];
        return Math.Abs(a - b) <= PartialEquilibrium * Math.Min(a, b);
    }

    /// <summary>
    /// g for species count <paramref name="x"/> in a reaction of total order <paramref name="order"/> that
    /// needs <paramref name="multiplicity"/> of its molecules: (m/ν)·Σ_{q&lt;ν} x/(x−q); +∞ when x &lt; ν
    /// (the reaction cannot fire, and the bound falls back to one molecule).
    /// </summary>
    internal static double OrderFactor(long x, int order, int multiplicity)
    {
        if (multiplicity <= 1) return order;
        if (x < multiplicity) return double.PositiveInfinity;
        var sum = 0.0;
        for (var q = 0; q < multiplicity; q++) sum += x / (double)(x - q);
        return (double)order / multiplicity * sum;
    }
}
