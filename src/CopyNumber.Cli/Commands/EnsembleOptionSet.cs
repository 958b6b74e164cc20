using System.CommandLine;
using System.Globalization;
using System.Security.Cryptography;
using CopyNumber.Ensembles;
using CopyNumber.Network;
using CopyNumber.Runs;

namespace CopyNumber.Cli.Commands;

/// <summary>
/// The options of an ensemble, declared and checked once for every command that runs one (simulate,
/// sweep), and bound into a <see cref="RunSpecification"/>. With a stored run (resume), an option left
/// out takes the stored value.
/// </summary>
internal sealed class EnsembleOptionSet
{
    /// <summary>Most worker threads accepted; more only add memory and contention.</summary>
    public static readonly int MaxThreads = Math.Max(1024, 4 * Environment.ProcessorCount);

    private readonly Option<long?> _replicates;
    private readonly Option<string> _method;
    private readonly Option<double> _epsilon;
    private readonly Option<ulong?> _seed;
    private readonly Option<int> _threads;
    private readonly Option<string?> _paths;
    private readonly Option<long?> _maxEvents;
    private readonly Option<double?> _maxWall;
    private readonly Option<string?>? _shard;
    private readonly Option<long?> _validationReplicates;
    private readonly Option<string?> _covariancePairs;
    private readonly Option<int?> _replicatesPerDraw;
    private readonly Option<string?>? _switching;

    /// <param name="replicatesText">What --replicates means for this command.</param>
    /// <param name="withShard">Whether the command takes --shard (a sweep does not).</param>
    public EnsembleOptionSet(string replicatesText, bool withShard)
    {
        _replicates = CountOption.Create("--replicates", replicatesText);
        _method = new("--method") { Description = "auto (chosen from the network's size and copy numbers; the reason is printed), direct (Gillespie's direct method), next-reaction (Gibson-Bruck), tau-leap (adaptive tau-leaping with a validation sample) or composition-rejection (for large networks).", DefaultValueFactory = _ => "auto" };
        _method.AcceptOnlyFromAmong([.. MethodChoice.Names]);
        _epsilon = new("--epsilon") { Description = "Tau-leaping error control: the largest relative change of any propensity in one leap, in (0, 1).", DefaultValueFactory = _ => RunSpecification.DefaultEpsilon };
        _seed = new("--seed") { Description = "Run seed; without it one is drawn and recorded in manifest.json." };
        _threads = new("--threads") { Description = "Worker threads (default: all cores).", DefaultValueFactory = _ => Environment.ProcessorCount };
        _paths = new("--paths") { Description = $"Write paths.parquet for the first N replicates, or 'all', or 0 for none (default {DefaultPathReplicates}: the report draws them beside the mean)." };
        _maxEvents = CountOption.Create("--max-events", "Stop a replicate after this many events; such replicates are counted and reported.");
        _maxWall = new("--max-wall") { Description = "Stop after this many seconds of wall-clock time, writing the blocks finished (partial; exit code 0 with a warning)." };
        if (withShard) _shard = new("--shard") { Description = "Run part i of n of the replicates (e.g. 2/8), for a job array; combine the parts with 'copynumber merge'." };
        _covariancePairs = new("--covariance-pairs")
        {
            Description = $"Species pairs whose covariance goes to covariances.parquet at every grid time: NAME:NAME pairs separated by commas, 'all' or 'none' (default: every pair up to {SpeciesPair.AllPairsUpTo} species, none beyond).",
        };
        _replicatesPerDraw = new("--replicates-per-draw")
        {
            Description = $"When parameters vary from cell to cell: replicates simulated with each cell's draw, for the intrinsic/extrinsic noise split (2, 4, 8, 16 or 32; default {EnsembleOptions.DefaultReplicatesPerDraw}).",
        };
        // One run's cores: a sweep or scan changes the counts from point to point, so they have no option there.
        if (withShard) _switching = new("--switching")
        {
            Description = "Follow the switching of species between a low and a high mode at every event: NAME=LOW..HIGH, several separated by commas "
                + "(e.g. U=9..21: low core U <= 9, high core U >= 21; a switch is an entry into the other core), or 'none'. "
                + "Default: cores from the rate equations' stable steady states when the model is bistable, none otherwise. Writes switching.parquet.",
        };
        _validationReplicates = CountOption.Create("--validation-replicates", "Exact replicates in the validation sample of a tau-leaping run (default: as many as about 10% of the run's time allows, at most 1024; see docs/methods.md).");
    }

    public void AddTo(Command command)
    {
        foreach (var option in new Option?[] { _replicates, _method, _epsilon, _seed, _threads, _paths, _maxEvents, _maxWall, _shard, _validationReplicates, _covariancePairs, _replicatesPerDraw, _switching })
            if (option is not null) command.Options.Add(option);
    }

    /// <summary>The options' values, checked, as a run specification.</summary>
    /// <param name="parsed">The parsed command line.</param>
    /// <param name="model">The model, compiled (at <paramref name="size"/> when set).</param>
    /// <param name="grid">The time grid, already checked.</param>
    /// <param name="stored">The settings of the run being resumed; options left out take these.</param>
    /// <param name="command">The command, for provenance.</param>
    /// <param name="size">A sweep's system size; null otherwise.</param>
    public RunSpecification Bind(ParseResult parsed, LoadedModel model, TimeGrid grid, StoredSettings? stored, string command, double? size = null)
    {
        T? Given<T>(Option<T?> option, T? fallback) where T : struct =>
            parsed.GetResult(option) is { Implicit: false } ? parsed.GetValue(option) : fallback ?? parsed.GetValue(option);

        var replicates = Given(_replicates, stored?.Replicates)
            ?? throw new UserInputException("--replicates is required (or --resume DIR, which takes it from the stored run)");
        if (replicates < 1) throw new UserInputException($"--replicates must be at least 1 (got {replicates})");
        var epsilon = parsed.GetResult(_epsilon) is { Implicit: false } ? parsed.GetValue(_epsilon) : stored?.Epsilon ?? parsed.GetValue(_epsilon);
        if (!(epsilon > 0 && epsilon < 1)) throw new UserInputException($"--epsilon must lie in (0, 1) (got {epsilon})");
        var threads = parsed.GetValue(_threads);
        if (threads < 1 || threads > MaxThreads) throw new UserInputException($"--threads must be between 1 and {MaxThreads} (got {threads})");
        var maxEvents = Given(_maxEvents, stored?.MaxEvents is long.MaxValue ? null : stored?.MaxEvents);
        if (maxEvents is < 1) throw new UserInputException($"--max-events must be at least 1 (got {maxEvents})");
        var wall = parsed.GetValue(_maxWall);
        if (wall is { } w && !(w > 0 && w <= TimeSpan.MaxValue.TotalSeconds / 2)) throw new UserInputException($"--max-wall must be a positive number of seconds (got {w})");
        var paths = parsed.GetResult(_paths) is { Implicit: false } ? ReadPaths(parsed.GetValue(_paths), replicates)
            : stored?.PathReplicates ?? Math.Min(DefaultPathReplicates, replicates);
        var shard = _shard is not null && parsed.GetResult(_shard) is { Implicit: false } ? ReadShard(parsed.GetValue(_shard), replicates) : stored?.Shard ?? Shard.Whole;
        var method = parsed.GetResult(_method) is { Implicit: false } ? parsed.GetValue(_method)! : stored?.MethodRequested ?? parsed.GetValue(_method)!;
        var sample = Given(_validationReplicates, stored?.ValidationReplicates);
        if (sample is < 2) throw new UserInputException($"--validation-replicates must be at least 2 (got {sample})");
        var seed = Given(_seed, stored?.Seed) ?? BitConverter.ToUInt64(RandomNumberGenerator.GetBytes(8));
        var pairs = parsed.GetResult(_covariancePairs) is { Implicit: false } ? parsed.GetValue(_covariancePairs) : stored?.CovariancePairs;
        if (pairs is not null)
        {
            try
            {
                SpeciesPair.Parse(pairs, model.Network);
            }
            catch (ArgumentException e)
            {
                throw new UserInputException($"--covariance-pairs: {e.Message}");
            }
        }
        var perDraw = Given(_replicatesPerDraw, stored?.ReplicatesPerDraw) ?? EnsembleOptions.DefaultReplicatesPerDraw;
        if (parsed.GetResult(_replicatesPerDraw) is { Implicit: false } && !model.Network.Variability.Any)
            throw new UserInputException("--replicates-per-draw applies only to a model whose parameters vary from cell to cell ('varies' in its parameters section); this one varies none");
        if (!EnsembleOptions.FitsBlock(perDraw, EnsembleOptions.DefaultBlockSize))
            throw new UserInputException($"--replicates-per-draw must be 2, 4, 8, 16 or 32, so that two groups fill a block of {EnsembleOptions.DefaultBlockSize} replicates (got {perDraw})");
        var (switching, switchingSource) = Switching(parsed, model, stored);
        return new RunSpecification
        {
            Model = model,
            Command = command,
            Size = size,
            Grid = grid,
            Replicates = replicates,
            Seed = seed,
            MethodRequested = method,
            Epsilon = epsilon,
            MaxEvents = maxEvents,
            PathReplicates = paths,
            Shard = shard,
            ValidationReplicates = sample,
            CovariancePairs = pairs,
            ReplicatesPerDraw = perDraw,
            Switching = switching,
            SwitchingSource = switchingSource,
            WallLimit = wall is { } seconds ? TimeSpan.FromSeconds(seconds) : null,
            Threads = threads,
        };
    }

    /// <summary>
    /// The cores whose modes the run follows, in order: --switching as given, the stored run's, or cores from the rate
    /// equations' stable steady states when the model is bistable (a simulate command only); null for none.
    /// </summary>
    private (string? Text, string? Source) Switching(ParseResult parsed, LoadedModel model, StoredSettings? stored)
    {
        if (_switching is null) return (null, null);
        if (parsed.GetResult(_switching) is { Implicit: false })
        {
            var text = parsed.GetValue(_switching) ?? "none";
            try
            {
                return (ModeCore.Text(ModeCore.Parse(text, model.Network)), "option");
            }
            catch (ArgumentException e)
            {
                throw new UserInputException($"--switching: {e.Message}");
            }
        }
        if (stored is not null) return (stored.Switching, stored.SwitchingSource);
        IReadOnlyList<ModeCore> found;
        try
        {
            found = Analysis.SteadyStates.SwitchingCores.Find(model.Network);
        }
        catch (Exception e) when (e is CopyNumberException or Deterministic.SolverFailureException or ArithmeticException)
        {
            return (null, null); // no steady states, no cores: the run goes on without switching statistics
        }
        return found.Count > 0 ? (ModeCore.Text(found), "steady-states") : (null, null);
    }

    /// <summary>
    /// Replicates whose paths are kept when --paths is not given: a few example trajectories for the report to draw beside
    /// the mean (issue 16). They are the first replicates by index, so the same whatever the threads or shards.
    /// </summary>
    public const long DefaultPathReplicates = 5;

    /// <summary>True when --paths was given on the command line.</summary>
    public bool PathsGiven(ParseResult parsed) => parsed.GetResult(_paths) is { Implicit: false };

    private static long ReadPaths(string? text, long replicates)
    {
        if (text is null) return 0;
        if (text == "all") return replicates;
        if (!long.TryParse(text, NumberStyles.None, CultureInfo.InvariantCulture, out var n) || n < 0)
            throw new UserInputException($"--paths takes a positive number of replicates, 0 for none, or 'all' (got '{text}')");
        return Math.Min(n, replicates);
    }

    private static Shard ReadShard(string? text, long replicates)
    {
        if (text is null) return Shard.Whole;
        if (!Shard.TryParse(text, out var shard, out var problem)) throw new UserInputException($"--shard: {problem}");
        var blocks = BlockRanges.BlocksFor(replicates, EnsembleOptions.DefaultBlockSize);
        if (shard.Count > blocks)
            throw new UserInputException($"--shard {shard}: {replicates} replicates make {blocks} block{(blocks == 1 ? "" : "s")} of {EnsembleOptions.DefaultBlockSize}, so at most {blocks} shard{(blocks == 1 ? "" : "s")}; use fewer shards or more replicates");
        return shard;
    }
}
