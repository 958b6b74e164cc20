using CopyNumber.Language;
using CopyNumber.Network;

namespace CopyNumber.Tests.Network;

// Schedule lines: times are evaluated from the parameters' initial values, changes are ordered by time
// with file order kept at equal times, values are compiled laws of the current state. Every expected
// value is worked out by hand from the lines below (common practice).
public class ScheduleCompilationTests
{
    private static ReactionNetwork Network() => new SyntaxBuilder(size: 2)
        .Species("A", 10).Species("B", 0)
        .Parameter("k", "0.5").Parameter("pulse", "3*k + 1")
        .Mass("convert", "A -> B", "k")
        .At("pulse", "A", ScheduleOperation.Add, "20*size")   // t = 2.5
        .At("1", "k", ScheduleOperation.Set, "k*4")           // t = 1
        .At("pulse", "B", ScheduleOperation.Set, "A/2")       // t = 2.5, after the first line
        .At("0", "A", ScheduleOperation.Subtract, "1")        // t = 0
        .Compile();

    [Fact]
    public void Changes_are_sorted_by_time_keeping_file_order_at_equal_times()
    {
        var schedule = Network().Schedule;
        Assert.Equal([0.0, 1.0, 2.5, 2.5], schedule.Select(s => s.Time));
        Assert.Equal(["A", "k", "A", "B"], schedule.Select(s => s.TargetName));
        Assert.Equal([ScheduleOperation.Subtract, ScheduleOperation.Set, ScheduleOperation.Add, ScheduleOperation.Set],
            schedule.Select(s => s.Operation));
    }

    [Fact]
    public void Targets_are_resolved_to_species_or_parameter_indices()
    {
        var schedule = Network().Schedule;
        Assert.Equal((ScheduleTarget.Species, 0), (schedule[0].Target, schedule[0].TargetIndex));
        Assert.Equal((ScheduleTarget.Parameter, 0), (schedule[1].Target, schedule[1].TargetIndex));
        Assert.Equal((ScheduleTarget.Species, 1), (schedule[3].Target, schedule[3].TargetIndex));
    }

    [Fact]
    public void Values_are_evaluated_on_the_current_state_and_parameters()
    {
        var schedule = Network().Schedule;
        double[] parameters = [0.75, 3.25];
        Assert.Equal(40.0, schedule[2].OnCounts([10, 0], parameters));        // 20·size, size = 2
        Assert.Equal(3.0, schedule[1].OnCounts([10, 0], parameters));         // k·4 with the current k
        Assert.Equal(7.0 / 2, schedule[3].OnCounts([7, 0], parameters));
        Assert.Equal(3.3 / 2, schedule[3].OnState([3.3, 0], parameters), 15);
    }
}
