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
    }

    /// <summary>τ' for the current state; +∞ when no bound applies (no non-critical reaction changes a read species).</summary>
    public double Select(long[] counts, double[] propensities, bool[] critical)
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
            for (var e = start[j]; e < start[j + 1]; e++)
            {
                double nu = amount[e];
                _mean[changed[e]] += nu * a;
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
