using System.Runtime.InteropServices;
using CopyNumber.Network;

namespace CopyNumber.Stochastic;

/// <summary>
/// The local linearisation tau-leaping needs: A_jk = ∂a_j/∂x_k for every reaction j and species k it
/// reads, and the Jacobian J = N·A of the mean drift restricted to the species R that are both read by
/// some propensity and changed by some reaction (the only ones through which the state feeds back on
/// the propensities). From J it bounds the network's fastest relaxation or growth rate by Gershgorin's
/// circle theorem (Gershgorin 1931, Izv. Akad. Nauk SSSR 6:749; quoted from memory):
/// every eigenvalue λ of J has |λ| ≤ ρ = max_i Σ_k |J_ik| and Re λ ≤ ρ₊ = max_i (J_ii + Σ_(k≠i) |J_ik|).
/// </summary>
/// <remarks>
/// A_jk is the central difference (a_j(x + e_k) − a_j(x − e_k))/2 on the lattice of counts — exact for
/// every mass-action propensity of order ≤ 2 (a polynomial of degree ≤ 2 in each count), and for rate
/// laws the natural derivative of a function defined only on counts (no symbolic derivative of a count
/// law exists). At x_k = 0 it is the forward difference. Reactions marked critical are left out of J:
/// they fire at most once per leap and are not leapt. Evaluated once per state, before the leap is drawn;
/// nothing is allocated after construction.
/// </remarks>
internal sealed class PropensityJacobian
{
    private readonly SimulatorState _state;
    private readonly int[] _pairStart;      // per reaction, its (reaction, read species) pairs
    private readonly int[] _pairSpecies;    // the read species k of each pair
    private readonly int[] _pairColumn;     // the index of k in R, or −1 when k is not in R
    private readonly int[] _entryRow;       // one entry per (changed species i ∈ R of j, pair (j, k ∈ R)): J_ik += ν_ij A_jk
    private readonly int[] _entryColumn;
    private readonly int[] _entryPair;
    private readonly int[] _entryReaction;
    private readonly double[] _entryChange;

    public PropensityJacobian(SimulatorState state, ReactionEffects effects)
    {
        _state = state;
        var network = state.Network;
        var speciesCount = state.SpeciesCount;
        var reactions = state.ReactionCount;

        var read = new List<int>[reactions];
        for (var j = 0; j < reactions; j++) read[j] = [];
        for (var k = 0; k < speciesCount; k++)
            foreach (var j in network.Dependencies.Readers(k)) read[j].Add(k);
        var changed = new bool[speciesCount];
        for (var e = 0; e < effects.ChangeSpecies.Length; e++) changed[effects.ChangeSpecies[e]] = true;
        var isRead = new bool[speciesCount];
        foreach (var list in read)
            foreach (var k in list) isRead[k] = true;

        var column = Enumerable.Repeat(-1, speciesCount).ToArray();
        var members = new List<int>();
        for (var k = 0; k < speciesCount; k++)
            if (isRead[k] && changed[k]) { column[k] = members.Count; members.Add(k); }
        Species = members.ToArray();

        _pairStart = new int[reactions + 1];
        var pairSpecies = new List<int>();
        for (var j = 0; j < reactions; j++)
        {
            _pairStart[j] = pairSpecies.Count;
            pairSpecies.AddRange(read[j]);
        }
        _pairStart[reactions] = pairSpecies.Count;
        _pairSpecies = pairSpecies.ToArray();
        _pairColumn = _pairSpecies.Select(k => column[k]).ToArray();
        Derivatives = new double[_pairSpecies.Length];

        var rows = new List<int>();
        var columns = new List<int>();
        var pairs = new List<int>();
        var owners = new List<int>();
        var changes = new List<double>();
        for (var j = 0; j < reactions; j++)
            for (var e = effects.ChangeStart[j]; e < effects.ChangeStart[j + 1]; e++)
            {
                var row = column[effects.ChangeSpecies[e]];
                if (row < 0) continue;
                for (var p = _pairStart[j]; p < _pairStart[j + 1]; p++)
                {
                    if (_pairColumn[p] < 0) continue;
                    rows.Add(row);
                    columns.Add(_pairColumn[p]);
                    pairs.Add(p);
                    owners.Add(j);
                    changes.Add(effects.ChangeAmount[e]);
                }
            }
        _entryRow = rows.ToArray();
        _entryColumn = columns.ToArray();
        _entryPair = pairs.ToArray();
        _entryReaction = owners.ToArray();
        _entryChange = changes.ToArray();
        Matrix = new double[Species.Length, Species.Length];
    }

    /// <summary>R: the species both read by a propensity and changed by a reaction, in network order.</summary>
    public int[] Species { get; }

    /// <summary>A_jk per (reaction, read species) pair, in events per unit time per molecule.</summary>
    public double[] Derivatives { get; }

    /// <summary>J restricted to R × R (per unit time), from the last <see cref="Update"/>.</summary>
    public double[,] Matrix { get; }

    /// <summary>ρ: Gershgorin's bound on |λ| over the eigenvalues of J, per unit time.</summary>
    public double Relaxation { get; private set; }

    /// <summary>ρ₊: Gershgorin's bound on the largest growth rate Re λ of J, per unit time (≤ 0: no mode grows).</summary>
    public double Growth { get; private set; }

    /// <summary>The first pair of reaction j in <see cref="Derivatives"/>; its pairs run to PairStart(j + 1).</summary>
    public int PairStart(int reaction) => _pairStart[reaction];

    /// <summary>The index in R of pair p's species, −1 when that species is not in R.</summary>
    public int PairColumn(int pair) => _pairColumn[pair];

    /// <summary>Recomputes A, J, ρ and ρ₊ at the state's current counts, leaving out the critical reactions.</summary>
    public void Update(bool[] critical)
    {
        var counts = _state.Counts;
        for (var j = 0; j < critical.Length; j++)
        {
            for (var p = _pairStart[j]; p < _pairStart[j + 1]; p++)
            {
                var k = _pairSpecies[p];
                var x = counts[k];
                counts[k] = x + 1;
                var up = Raw(j);
                double down;
                double width;
                if (x > 0)
                {
                    counts[k] = x - 1;
                    down = Raw(j);
                    width = 2.0;
                }
                else
                {
                    counts[k] = x;
                    down = Raw(j);
                    width = 1.0;
                }
                counts[k] = x;
                var d = (up - down) / width;
                Derivatives[p] = double.IsFinite(d) ? d : 0.0;
            }
        }

        Array.Clear(Matrix);
        for (var e = 0; e < _entryRow.Length; e++)
            if (!critical[_entryReaction[e]])
                Matrix[_entryRow[e], _entryColumn[e]] += _entryChange[e] * Derivatives[_entryPair[e]];

        var relaxation = 0.0;
        var growth = double.NegativeInfinity;
        var n = Species.Length;
        for (var i = 0; i < n; i++)
        {
            var off = 0.0;
            for (var k = 0; k < n; k++)
                if (k != i) off += Math.Abs(Matrix[i, k]);
            relaxation = Math.Max(relaxation, off + Math.Abs(Matrix[i, i]));
            growth = Math.Max(growth, Matrix[i, i] + off);
        }
        Relaxation = relaxation;
        Growth = n == 0 ? 0.0 : growth;
    }

    /// <summary>a_j at the current counts without the usability check (a rate law may be unusable one molecule away).</summary>
    private double Raw(int reaction) =>
        PropensityTerm.Evaluate(ref _state.Terms[reaction], ref MemoryMarshal.GetArrayDataReference(_state.Counts), reaction, _state);
}
