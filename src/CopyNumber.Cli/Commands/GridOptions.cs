using System.CommandLine;
using System.Globalization;
using CopyNumber.Network;

namespace CopyNumber.Cli.Commands;

/// <summary>--until and --every, shared by solve, simulate and sweep, checked into a <see cref="TimeGrid"/>.</summary>
internal sealed class GridOptions
{
    /// <summary>More grid points than this would not fit comfortably in memory or in a table.</summary>
    public const long MaxPoints = 10_000_000;

    /// <param name="required">False for simulate, where --resume supplies the stored grid; <see cref="Read"/> then asks for the options itself.</param>
    public GridOptions(bool required = true)
    {
        Until = new("--until") { Description = "Final time T (model time units).", Required = required };
        Every = new("--every") { Description = "Recording interval: the grid is 0, DT, 2 DT, ..., T.", Required = required };
    }

    public Option<double> Until { get; }
    public Option<double> Every { get; }

    public void AddTo(Command command)
    {
        command.Options.Add(Until);
        command.Options.Add(Every);
    }

    /// <param name="parsed">The parsed command line.</param>
    /// <param name="stored">The grid of a resumed run: an option left out takes its value.</param>
    public TimeGrid Read(ParseResult parsed, TimeGrid? stored = null)
    {
        var until = Given(Until, stored?.Until);
        var every = Given(Every, stored?.Every);
        if (!(until > 0) || double.IsInfinity(until)) throw new UserInputException($"--until must be a positive, finite time (got {until})");
        if (!(every > 0) || double.IsInfinity(every)) throw new UserInputException($"--every must be a positive time (got {every})");
        if (every > until) throw new UserInputException($"--every ({every}) is larger than --until ({until}); the grid would hold only time 0");
        // Counted by the grid's own rule, so the number in the message is the number the grid would have.
        var points = TimeGrid.PointCount(until, every);
        if (points > MaxPoints)
            throw new UserInputException($"the grid would have {points.ToString("N0", CultureInfo.InvariantCulture)} points (--until {Plain(until)} / --every {Plain(every)}); at most {MaxPoints.ToString("N0", CultureInfo.InvariantCulture)} are allowed: choose a larger --every");
        return new TimeGrid(until, every);

        double Given(Option<double> option, double? fallback) =>
            parsed.GetResult(option) is { Implicit: false } || fallback is null && option.Required ? parsed.GetValue(option)
            : fallback ?? throw new UserInputException($"{option.Name} is required (or --resume DIR, which takes it from the stored run)");
    }

    private static string Plain(double value) => value.ToString("R", CultureInfo.InvariantCulture);
}
