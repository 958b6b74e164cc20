using System.Runtime.CompilerServices;
using CopyNumber.Network;
using CopyNumber.Stochastic;
using CopyNumber.Stochastic.Locality;

namespace CopyNumber.Benchmarks;

/// <summary>
/// What one composition–rejection event touches in memory, counted from the layouts instead of timed
/// (the machine has no hardware counters for perf): distinct 64-byte cache lines and 4-KiB pages per event,
/// averaged over the reactions weighted by a_j/a0 at the initial state (the probability that j fires),
/// for the flat layout of version 0.2.0 (entries of 16 bytes; headers, count changes and propensity updates
/// in three arrays indexed by the user's numbering) and for the packed layout with and without the
/// renumbering. Each array is taken to start on its own line and page; the member-list slot the rejection
/// step reads (one line in both layouts) is not counted. `B quick lines [M …]`.
/// </summary>
internal static class LayoutFootprint
{
    private const int Line = 64;
    private const int Page = 4096;

    public static void Run(int[] sizes)
    {
        if (sizes is [0]) sizes = [10, 100, 1_000, 10_000, 100_000];
        Console.WriteLine("     M | layout                 | lines/event | pages/event | bytes of per-reaction data | RCM bandwidth / user bandwidth");
        foreach (var m in sizes)
        {
            var network = SyntheticNetwork.Create(m);
            var effects = new ReactionEffects(network, includeFired: false);
            var state = new SimulatorState(network);
            state.Reset();
            var weight = Enumerable.Range(0, m).Select(j => state.Evaluate(j, 0)).ToArray();
            var total = weight.Sum();
            var flat = Flat(network, effects, state, weight, total);
            Console.WriteLine($"{m,6} | flat (0.2.0)           | {flat.Lines,11:F1} | {flat.Pages,11:F1} | {flat.Bytes,26:N0} |");
            foreach (var renumber in new[] { false, true })
            {
                var packed = new PackedCompositionRejection(network, new SimulatorOptions(), renumber: renumber);
                var (lines, pages, bytes) = Packed(network, effects, packed, weight, total);
                var widths = renumber
                    ? $"{DependencyOrder.Bandwidth(effects.DependentStart, effects.Dependents, packed.ReactionRank.ToArray()):N0} / {DependencyOrder.Bandwidth(effects.DependentStart, effects.Dependents, Enumerable.Range(0, m).ToArray()):N0}"
                    : "";
                Console.WriteLine($"{m,6} | packed, {(renumber ? "RCM order " : "user order"),-14} | {lines,11:F1} | {pages,11:F1} | {bytes,26:N0} | {widths}");
            }
        }
    }

    /// <summary>The touched addresses of one event, as (array, byte offset) pairs, reduced to distinct lines and pages.</summary>
    private sealed class Touches
    {
        private readonly HashSet<(int, long)> _lines = [];
        private readonly HashSet<(int, long)> _pages = [];

        public void Add(int array, long offset, int size)
        {
            for (var b = offset / Line; b <= (offset + size - 1) / Line; b++) _lines.Add((array, b));
            for (var p = offset / Page; p <= (offset + size - 1) / Page; p++) _pages.Add((array, p));
        }

        public (int Lines, int Pages) Count() => (_lines.Count, _pages.Count);
    }

    private static (double Lines, double Pages, long Bytes) Flat(ReactionNetwork network, ReactionEffects effects, SimulatorState state, double[] weight, double total)
    {
        const int Entries = 0, Headers = 1, Changes = 2, Updates = 3, Counts = 4;
        const int EntrySize = 16; // Value, Group, Slot in version 0.2.0
        var header = Unsafe.SizeOf<FiringProgram.Header>();
        var change = Unsafe.SizeOf<FiringProgram.CountChange>();
        var update = Unsafe.SizeOf<FiringProgram.PropensityUpdate>();
        double lines = 0, pages = 0;
        for (var j = 0; j < weight.Length; j++)
        {
            var touches = new Touches();
            touches.Add(Entries, (long)j * EntrySize, EntrySize);
            touches.Add(Headers, (long)j * header, header);
            for (var e = effects.ChangeStart[j]; e < effects.ChangeStart[j + 1]; e++)
            {
                touches.Add(Changes, (long)e * change, change);
                touches.Add(Counts, effects.ChangeSpecies[e] * 8L, 8);
            }
            for (var u = effects.DependentStart[j]; u < effects.DependentStart[j + 1]; u++)
            {
                var k = effects.Dependents[u];
                touches.Add(Updates, (long)u * update, update);
                touches.Add(Entries, (long)k * EntrySize, EntrySize);
                foreach (var (species, _) in network.Propensities.Reactants(k)) touches.Add(Counts, species * 8L, 8);
            }
            var (l, p) = touches.Count();
            lines += weight[j] / total * l;
            pages += weight[j] / total * p;
        }
        var bytes = (long)weight.Length * (EntrySize + header) + (long)effects.ChangeSpecies.Length * change + (long)effects.Dependents.Length * update
            + state.SpeciesCount * 8L;
        return (lines, pages, bytes);
    }

    private static (double Lines, double Pages, long Bytes) Packed(ReactionNetwork network, ReactionEffects effects, PackedCompositionRejection packed, double[] weight, double total)
    {
        const int Entries = 0, Program = 1, Counts = 2;
        const int EntrySize = 32;
        var rank = packed.ReactionRank;
        var speciesRank = packed.SpeciesRank;
        var start = packed.ProgramStart;
        double lines = 0, pages = 0;
        for (var j = 0; j < weight.Length; j++)
        {
            var touches = new Touches();
            var r = rank[j];
            touches.Add(Entries, (long)r * EntrySize, EntrySize);
            var changes = effects.ChangeStart[j + 1] - effects.ChangeStart[j];
            var dependents = effects.DependentStart[j + 1] - effects.DependentStart[j];
            touches.Add(Program, start[r] * 4L, 4 * (3 + 2 * changes + dependents));
            for (var e = effects.ChangeStart[j]; e < effects.ChangeStart[j + 1]; e++) touches.Add(Counts, speciesRank[effects.ChangeSpecies[e]] * 8L, 8);
            for (var u = effects.DependentStart[j]; u < effects.DependentStart[j + 1]; u++)
            {
                var k = effects.Dependents[u];
                touches.Add(Entries, (long)rank[k] * EntrySize, EntrySize);
                foreach (var (species, _) in network.Propensities.Reactants(k)) touches.Add(Counts, speciesRank[species] * 8L, 8);
            }
            var (l, p) = touches.Count();
            lines += weight[j] / total * l;
            pages += weight[j] / total * p;
        }
        var bytes = (long)weight.Length * (EntrySize + 4 * 3 + 4) + effects.ChangeSpecies.Length * 8L + effects.Dependents.Length * 4L + speciesRank.Length * 8L;
        return (lines, pages, bytes);
    }
}
