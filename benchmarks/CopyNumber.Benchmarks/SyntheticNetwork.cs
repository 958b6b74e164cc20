using System.Globalization;
using CopyNumber.Kinetics;
using CopyNumber.Language;
using CopyNumber.Network;
using CopyNumber.Randomness;

namespace CopyNumber.Benchmarks;

/// <summary>
/// Random sparse mass-action networks of any size for the scaling benchmarks, the same for a given size
/// and seed. S = max(2, M/2) species start at 100 copies each; half the reactions are first order,
/// A → B, chained along a random cyclic order of the species so that every species drains into the next
/// one (the chain is strongly connected: no species is a sink that would absorb all the mass and stop the
/// run), the other half second order, A + B → C + D (A ≠ B) with species drawn uniformly. Every reaction
/// conserves the total number of molecules, so copy numbers stay bounded by 100·S and each replicate
/// settles into a steady state instead of growing or dying out. Macroscopic constants are log-uniform on [0.1, 10]
/// and the system size is Ω = 100, so a second-order propensity k·x_A·x_B/Ω is of the same order as a
/// first-order one near 100 copies. Each species is read by about 1.5·M/S = 3 reactions, so an event
/// updates a handful of propensities whatever M is: the work per event that remains M-dependent is the
/// selection and the memory traffic.
/// </summary>
internal static class SyntheticNetwork
{
    private const double Size = 100;
    private const long InitialCount = 100;

    public static ReactionNetwork Create(int reactions, ulong seed = 2008)
    {
        var rng = new Xoshiro256StarStar(seed);
        var speciesCount = Math.Max(2, reactions / 2);
        int Pick() => (int)(rng.NextUInt64() % (ulong)speciesCount);
        var cycle = Enumerable.Range(0, speciesCount).ToArray();
        for (var i = cycle.Length - 1; i > 0; i--)
        {
            var swap = (int)(rng.NextUInt64() % (ulong)(i + 1));
            (cycle[i], cycle[swap]) = (cycle[swap], cycle[i]);
        }

        var species = Enumerable.Range(0, speciesCount).Select(i => "S" + i.ToString(CultureInfo.InvariantCulture)).ToArray();
        var columns = new List<IReadOnlyList<(int, long)>>(reactions);
        var reactants = new List<IReadOnlyList<(int Species, long Order)>>(reactions);
        var constants = new List<StateLaw?>(reactions);
        var reads = new List<IReadOnlyCollection<int>>(reactions);
        var list = new List<Reaction>(reactions);
        for (var j = 0; j < reactions; j++)
        {
            var k = 0.1 * Math.Pow(100, rng.NextDouble());
            List<(int, long)> left, right;
            if (j % 2 == 0)
            {
                var link = j / 2 % speciesCount;
                left = [(cycle[link], 1)];
                right = [(cycle[(link + 1) % speciesCount], 1)];
            }
            else
            {
                var a = Pick();
                int b;
                do b = Pick(); while (b == a);
                left = [(a, 1), (b, 1)];
                right = [(Pick(), 1), (Pick(), 1)];
            }
            columns.Add(left.Select(e => (e.Item1, -e.Item2)).Concat(right).ToList());
            // The propensity's reactant list is the left side, with its orders; A ≠ B keeps it bimolecular.
            reactants.Add(left.Select(e => (e.Item1, e.Item2)).ToList());
            constants.Add((_, _) => k);
            reads.Add(left.Select(e => e.Item1).ToArray());
            list.Add(new Reaction("R" + j.ToString(CultureInfo.InvariantCulture), left, right, LawKind.Mass, k.ToString("R", CultureInfo.InvariantCulture)));
        }

        var stoichiometry = new Stoichiometry(speciesCount, columns);
        var propensities = new Propensities(Size, reactants, constants, new CountLaw?[reactions]);
        var rateEquations = new RateEquations(stoichiometry, propensities, new StateLaw?[reactions],
            Enumerable.Range(0, reactions).Select(_ => (IReadOnlyList<(int, StateLaw)>)[]).ToList());
        return new ReactionNetwork(
            $"synthetic-{reactions}", "synthetic", Size, species, Enumerable.Repeat(InitialCount, speciesCount).ToList(),
            [], [], list, stoichiometry, new DependencyGraph(stoichiometry, reads), propensities, rateEquations, [], []);
    }
}
