using CopyNumber.Network;

namespace CopyNumber.Tests.Network;

// A sweep over the system size Ω keeps concentrations: counts scale by Ω/Ω₀ (rounded to the nearest
// whole count), mass-action k stays in concentration units, and `size` takes the new value. Expected
// numbers are computed by hand from those rules; propensities from Gillespie (1977, J. Phys. Chem. 81:2340),
// a = Ω·k·∏ ff(x_i, ν_i)/Ω^ν_i.
public class SizeOverrideTests
{
    private static SyntaxBuilder Model() => new SyntaxBuilder(size: 10)
        .Species("A", 25).Species("B", 3).Species("C", 5).Species("D", 0)
        .Parameter("k", "0.5")
        .Parameter("influx", "2*size")
        .Mass("bind", "A + B -> D", "k")
        .Rate("feed", "0 -> A", "influx")
        .Readout("conc", "A/size");

    [Fact]
    public void Counts_are_scaled_and_rounded_to_the_nearest_whole_count()
    {
        var network = Model().Compile(new CompileOptions(SizeOverride: 4));
        Assert.Equal(4.0, network.Size);
        // 25·0.4 = 10, 3·0.4 = 1.2 → 1, 5·0.4 = 2 exactly, 0 stays 0
        Assert.Equal([10L, 1, 2, 0], network.InitialCounts);
        var halves = Model().Compile(new CompileOptions(SizeOverride: 5));
        // 25·0.5 = 12.5 → 13 and 5·0.5 = 2.5 → 3 (halves away from zero, not to even), 3·0.5 = 1.5 → 2
        Assert.Equal([13L, 2, 3, 0], halves.InitialCounts);
    }

    [Fact]
    public void Concentrations_and_mass_constants_are_kept_and_size_takes_the_new_value()
    {
        var network = Model().Compile(new CompileOptions(SizeOverride: 40));
        Assert.Equal([100L, 12, 20, 0], network.InitialCounts);
        Assert.Equal(25 / 10.0, network.Readouts[0].OnCounts(network.InitialCounts.ToArray(), []), 15);
        var parameters = network.InitialParameterValues.ToArray();
        Assert.Equal([0.5, 80.0], parameters); // influx = 2·size with size = 40
        var constants = network.ConstantsFor(parameters);
        long[] counts = [100, 12, 20, 0];
        Assert.Equal(40 * 0.5 * (100 / 40.0) * (12 / 40.0), network.Propensities.Evaluate(0, counts, constants, parameters), 12);
        Assert.Equal(80.0, network.Propensities.Evaluate(1, counts, constants, parameters));
    }

    [Fact]
    public void No_override_keeps_the_model_as_written()
    {
        var network = Model().Compile();
        Assert.Equal(10.0, network.Size);
        Assert.Equal([25L, 3, 5, 0], network.InitialCounts);
        Assert.Equal([0.5, 20.0], network.InitialParameterValues);
    }

    [Fact]
    public void A_count_that_overflows_when_scaled_is_reported_at_its_species()
    {
        var diagnostics = new SyntaxBuilder(size: 1)
            .Species("A", 5_000_000_000_000_000_000).Species("B", 1)
            .Mass("d", "A -> 0", "1")
            .Failures(new CompileOptions(SizeOverride: 10));
        var d = Assert.Single(diagnostics);
        Assert.Equal(1, d.Position.Line);
        Assert.Contains("'A'", d.Message);
        Assert.Contains("more than a count can hold", d.Message);
    }

    [Theory]
    [InlineData(0.0)]
    [InlineData(-3.0)]
    [InlineData(double.NaN)]
    [InlineData(double.PositiveInfinity)]
    public void A_size_override_must_be_positive_and_finite(double size)
    {
        var d = Assert.Single(Model().Failures(new CompileOptions(SizeOverride: size)));
        Assert.Contains("size override", d.Message);
    }
}
