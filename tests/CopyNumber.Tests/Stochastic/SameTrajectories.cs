using CopyNumber.Network;
using CopyNumber.Randomness;
using CopyNumber.Stochastic;
using CopyNumber.Tests.Language;

namespace CopyNumber.Tests.Stochastic;

/// <summary>
/// Two simulators that must agree to the bit (a specialised loop against the general one it was derived
/// from): for the same stream, every replicate gives the same counts at every grid time, the same events,
/// the same event-limit flag, the same switch counts and leaves the stream in the same place.
/// </summary>
internal static class SameTrajectories
{
    /// <param name="reference">The general simulator, the oracle.</param>
    /// <param name="candidate">The specialised one.</param>
    /// <param name="grid">The recording grid.</param>
    /// <param name="replicates">Replicates run one after the other on each simulator, so state carried between replicates is compared too.</param>
    /// <param name="seed">The stream's seed.</param>
    /// <param name="afterEach">Further checks after each replicate (e.g. that the specialised path ran).</param>
    public static void Check(IStochasticSimulator reference, IStochasticSimulator candidate, TimeGrid grid, int replicates, ulong seed, Action? afterEach = null)
    {
        var rngReference = new Xoshiro256StarStar(seed);
        var rngCandidate = new Xoshiro256StarStar(seed);
        for (var r = 0; r < replicates; r++)
        {
            var expected = new Recording();
            var actual = new Recording();
            var expectedResult = reference.Run(ref rngReference, grid, expected);
            var actualResult = candidate.Run(ref rngCandidate, grid, actual);
            afterEach?.Invoke();
            Assert.Equal(expectedResult.Events, actualResult.Events);
            Assert.Equal(expectedResult.HitEventLimit, actualResult.HitEventLimit);
            Assert.Equal(expectedResult.Switches.ToArray(), actualResult.Switches.ToArray());
            Assert.Equal(expected.Rows.Count, actual.Rows.Count);
            for (var i = 0; i < expected.Rows.Count; i++) Assert.Equal(expected.Rows[i], actual.Rows[i]);
            Assert.Equal(rngReference.NextUInt64(), rngCandidate.NextUInt64());
        }
    }

    /// <summary>Seeds 1–8 of the random networks each comparison runs on.</summary>
    public static readonly TheoryData<int> RandomSeeds = new(Enumerable.Range(1, 8));

    /// <summary>
    /// Runs <see cref="Check"/> (20 replicates to t = 200, seed 11) on every bundled scenario that
    /// <paramref name="accepts"/> through <paramref name="check"/> (network, grid, replicates, seed); returns the file names checked.
    /// </summary>
    public static List<string> CheckBundledScenarios(Func<ReactionNetwork, bool> accepts, Action<ReactionNetwork, TimeGrid, int, ulong> check)
    {
        var accepted = new List<string>();
        foreach (var file in Directory.GetFiles(LanguageTestSupport.ScenariosFolder(), "*.cnet").Order())
        {
            var network = ModelLoader.Load(file).Model!.Network;
            if (!accepts(network)) continue;
            accepted.Add(Path.GetFileName(file));
            check(network, new TimeGrid(200, 2), 20, 11);
        }
        return accepted;
    }

    /// <summary>Keeps every recorded row as text: grid index, time to the bit, counts.</summary>
    internal sealed class Recording : ITrajectoryObserver
    {
        public List<string> Rows { get; } = [];

        public void Record(int gridIndex, double time, long[] counts, double[] parameters) =>
            Rows.Add($"{gridIndex} {time:R} {string.Join(' ', counts)}");
    }
}
