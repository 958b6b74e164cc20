using System.Runtime.CompilerServices;
using CopyNumber.Kinetics;
using CopyNumber.Network;

namespace CopyNumber.Stochastic;

/// <summary>
/// What one firing of each reaction does, flattened for the inner loops: the count changes (the sparse
/// column of N) and the reactions whose propensities must then be recomputed (the dependency graph's
/// rows; Gibson &amp; Bruck 2000). Every index is checked here once, so the programs compiled from these
/// lists (<see cref="FiringProgram"/>) may skip bounds checks.
/// </summary>
/// <remarks>
/// A reaction whose affected list the graph does not store (<see cref="DependencyGraph.IsBroad"/>) has
/// no dependents here; it is marked in <see cref="IsBroad"/> and its updates are the readers
/// (<see cref="ReaderStart"/>, <see cref="Readers"/>) of the species it changes, walked at each firing.
/// </remarks>
internal sealed class ReactionEffects
{
    /// <param name="network">The network.</param>
    /// <param name="includeFired">
    /// Also list each reaction among its own dependents even when it reads none of the species it changes
    /// (the next reaction method must redraw the fired reaction's time in any case).
    /// </param>
    public ReactionEffects(ReactionNetwork network, bool includeFired)
    {
        var n = network.Stoichiometry;
        var species = n.SpeciesCount;
        var reactions = n.ReactionCount;
        ChangeStart = new int[reactions + 1];
        DependentStart = new int[reactions + 1];
        MayMakeNegative = new bool[reactions];
        IsBroad = new bool[reactions];
        IncludesFired = includeFired;
        var changeSpecies = new List<int>();
        var changeAmount = new List<long>();
        var dependents = new List<int>();
        for (var j = 0; j < reactions; j++)
        {
            ChangeStart[j] = changeSpecies.Count;
            var changed = n.ChangedSpecies(j);
            var amounts = n.Changes(j);
            for (var e = 0; e < changed.Length; e++)
            {
                if ((uint)changed[e] >= (uint)species) throw new ArgumentException($"reaction {j} changes species index {changed[e]}, outside the network's {species} species");
                changeSpecies.Add(changed[e]);
                changeAmount.Add(amounts[e]);
                // Mass action never over-consumes: its propensity is 0 without the reactants and a net loss
                // never exceeds the reactant coefficient. A rate law carries no such guarantee.
                if (amounts[e] < 0 && network.Propensities.Form(j) == PropensityForm.RateLaw) MayMakeNegative[j] = true;
            }

            DependentStart[j] = dependents.Count;
            if (network.Dependencies.IsBroad(j))
            {
                IsBroad[j] = true;
                continue;
            }
            var affected = network.Dependencies.Affected(j);
            var selfListed = false;
            foreach (var k in affected)
            {
                if ((uint)k >= (uint)reactions) throw new ArgumentException($"the dependency graph lists reaction index {k}, outside the network's {reactions} reactions");
                if (includeFired && !selfListed && k > j) { dependents.Add(j); selfListed = true; }
                if (k == j) selfListed = true;
                dependents.Add(k);
            }
            if (includeFired && !selfListed) dependents.Add(j);
        }
        ChangeStart[reactions] = changeSpecies.Count;
        DependentStart[reactions] = dependents.Count;
        ChangeSpecies = changeSpecies.ToArray();
        ChangeAmount = changeAmount.ToArray();
        Dependents = dependents.ToArray();
        ReaderStart = new int[species + 1];
        var readers = new List<int>();
        for (var i = 0; i < species; i++)
        {
            ReaderStart[i] = readers.Count;
            foreach (var k in network.Dependencies.Readers(i))
            {
                if ((uint)k >= (uint)reactions) throw new ArgumentException($"the dependency graph lists reaction index {k}, outside the network's {reactions} reactions");
                readers.Add(k);
            }
        }
        ReaderStart[species] = readers.Count;
        Readers = readers.ToArray();
    }

    /// <summary>Reaction j's count changes are entries ChangeStart[j] .. ChangeStart[j+1]−1.</summary>
    public int[] ChangeStart { get; }
    public int[] ChangeSpecies { get; }
    public long[] ChangeAmount { get; }

    /// <summary>Reaction j's dependents are entries DependentStart[j] .. DependentStart[j+1]−1, sorted.</summary>
    public int[] DependentStart { get; }
    public int[] Dependents { get; }

    /// <summary>Species i's readers are entries ReaderStart[i] .. ReaderStart[i+1]−1, sorted.</summary>
    public int[] ReaderStart { get; }
    public int[] Readers { get; }

    /// <summary>Whether each reaction's own propensity is among its updates (the includeFired choice).</summary>
    public bool IncludesFired { get; }

    /// <summary>True for reactions whose updates are walked through <see cref="Readers"/> instead of listed in <see cref="Dependents"/>.</summary>
    public bool[] IsBroad { get; }

    /// <summary>True for rate-law reactions that consume a species: their firing must be checked.</summary>
    public bool[] MayMakeNegative { get; }


    /// <summary>The first species of <paramref name="reaction"/>'s changes that is negative in <paramref name="counts"/>, or −1.</summary>
    public int FirstNegative(int reaction, long[] counts)
    {
        for (var e = ChangeStart[reaction]; e < ChangeStart[reaction + 1]; e++)
            if (counts[ChangeSpecies[e]] < 0) return ChangeSpecies[e];
        return -1;
    }

    /// <summary>Stops the run when <paramref name="reaction"/>'s firing has just made one of its species negative.</summary>
    [MethodImpl(MethodImplOptions.NoInlining)]
    public void CheckFiring(int reaction, SimulatorState state, double time)
    {
        var species = FirstNegative(reaction, state.Counts);
        if (species >= 0) state.ThrowFiringMadeNegative(reaction, species, time);
    }
}
