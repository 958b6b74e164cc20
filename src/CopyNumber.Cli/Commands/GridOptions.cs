using System.CommandLine;
using System.Globalization;
using CopyNumber.Network;

namespace CopyNumber.Cli.Commands;

/// <summary>--until and --every, shared by solve, simulate and sweep, checked into a <see cref="TimeGrid"/>.</summary>
internal sealed class GridOptions
{
    /// <summary>More grid points than this would not fit comfortably in memory or in a table.</summary>
    public const long MaxPoints = 10_000_000;

    public Option<double> Until { get; } = new("--until") { Description = "Final time T (model time units).", Required = true };
    public Option<double> Every { get; } = new("--every") { Description = "Recording interval: the grid is 0, DT, 2 DT, ..., T.", Required = true };

    public void AddTo(Command command)
    {
        command.Options.Add(Until);
        command.Options.Add(Every);
    }

    public TimeGrid Read(ParseResult parsed)
    {
        var until = parsed.GetValue(Until);
        var every = parsed.GetValue(Every);
        if (!(until > 0) || double.IsInfinity(until)) throw new UserInputException($"--until must be a positive, finite time (got {until})");
        if (!(every > 0) || double.IsInfinity(every)) throw new UserInputException($"--every must be a positive time (got {every})");
        if (every > until) throw new UserInputException($"--every ({every}) is larger than --until ({until}); the grid would hold only time 0");
        // Counted by the grid's own rule, so the number in the message is the number the grid would have.
        var points = TimeGrid.PointCount(until, every);
        if (points > MaxPoints)
            throw new UserInputException($"the grid would have {points.ToString("N0", CultureInfo.InvariantCulture)} points (--until {Plain(until)} / --every {Plain(every)}); at most {MaxPoints.ToString("N0", CultureInfo.InvariantCulture)} are allowed: choose a larger --every");
        return new TimeGrid(until, every);
    }

    private static string Plain(double value) => value.ToString("R", CultureInfo.InvariantCulture);
}
