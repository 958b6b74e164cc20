using CopyNumber.Cli.Rendering;

namespace CopyNumber.Tests.Cli;

/// <summary>
/// The progress line's remaining-time estimate (issue 10, fault 4: --replicates 2^63 − 1 crashed the
/// progress timer with a TimeSpan overflow after its first 5 s tick, exit 134, nothing saved). The
/// estimate elapsed × (total − done) / done is common practice; the expected texts below are worked by hand.
/// </summary>
public sealed class TimeLeftTests
{
    [Theory]
    [InlineData(5.0, 1L)]          // the first tick of a plain-text log, one replicate finished
    [InlineData(5.0, 1000L)]
    [InlineData(1e-9, 1L)]         // the display's floor on the elapsed time
    [InlineData(0.25, 3L)]         // the first terminal tick
    public void A_run_of_two_to_the_63_replicates_saturates_instead_of_throwing(double elapsed, long done)
    {
        // 5 s × (2^63 − 2) / 1 ≈ 4.6·10^19 s ≈ 1.5·10^12 years: far past TimeSpan.MaxValue (≈ 2.9·10^4 years)
        // for the first rows; the elapsed 1e-9 s row is ≈ 292 years, still past the 100-year saturation.
        Assert.Equal("more than 100 years left", TimeLeft.Describe(elapsed, done, long.MaxValue));
    }

    [Fact]
    public void Just_under_the_saturation_prints_days()
    {
        // 1 s per replicate with 36 000 left: 36 000 s = 10 h 0 min 0 s; 3 456 000 s = 40 days.
        Assert.Equal("10:00:00 left", TimeLeft.Describe(1.0, 1, 36_001));
        Assert.Equal("40 days left", TimeLeft.Describe(1.0, 1, 3_456_001));
        // 99 years of 365.25 days = 3 124 202 400 s, under the 100-year saturation: 36 159 days.
        Assert.Equal("36159 days left", TimeLeft.Describe(1.0, 1, 3_124_202_401));
    }

    [Fact]
    public void Ordinary_estimates_read_minutes_and_seconds()
    {
        Assert.Equal("2:00 left", TimeLeft.Describe(60, 1, 3));    // 60 s × 2 / 1 = 120 s
        Assert.Equal("0:05 left", TimeLeft.Describe(10, 2, 3));    // 10 s × 1 / 2 = 5 s
        Assert.Equal("0:00 left", TimeLeft.Describe(10, 3, 3));    // finished
        Assert.Equal("estimating", TimeLeft.Describe(10, 0, long.MaxValue));
    }
}
