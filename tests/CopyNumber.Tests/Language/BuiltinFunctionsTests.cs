using CopyNumber.Language;

namespace CopyNumber.Tests.Language;

// Values follow from the definitions of the Hill and Michaelis-Menten functions (Alon 2007,
// An Introduction to Systems Biology, ch. 2; quoted from memory): at x = K each is one half, and
// activation plus repression is one.
public sealed class BuiltinFunctionsTests
{
    [Fact]
    public void EveryFunctionOfTheLanguageHasItsArity()
    {
        var expected = new Dictionary<string, int>
        {
            ["exp"] = 1, ["log"] = 1, ["sqrt"] = 1, ["pow"] = 2, ["min"] = 2, ["max"] = 2, ["abs"] = 1,
            ["sin"] = 1, ["cos"] = 1, ["hill_act"] = 3, ["hill_rep"] = 3, ["mm"] = 2, ["choose"] = 3,
        };
        Assert.Equal(expected.OrderBy(p => p.Key), BuiltinFunctions.Arity.OrderBy(p => p.Key));
        Assert.Equal(expected.Keys.Order(), BuiltinFunctions.Signature.Keys.Order());
    }

    [Theory]
    [InlineData(1.0)]
    [InlineData(2.0)]
    [InlineData(4.5)]
    public void HillFunctionsAreOneHalfAtTheirThresholdAndSumToOne(double n)
    {
        Assert.Equal(0.5, BuiltinFunctions.Apply("hill_act", [7, 7, n]), 15);
        Assert.Equal(0.5, BuiltinFunctions.Apply("hill_rep", [7, 7, n]), 15);
        foreach (var x in new[] { 0.0, 0.3, 3, 30 })
            Assert.Equal(1.0, BuiltinFunctions.Apply("hill_act", [x, 3, n]) + BuiltinFunctions.Apply("hill_rep", [x, 3, n]), 14);
        // x^n/(K^n + x^n) written out for x = 2, K = 1
        Assert.Equal(Math.Pow(2, n) / (1 + Math.Pow(2, n)), BuiltinFunctions.Apply("hill_act", [2, 1, n]), 15);
    }

    [Fact]
    public void ElementaryFunctionsMeanWhatTheirNamesSay()
    {
        Assert.Equal(0.5, BuiltinFunctions.Apply("mm", [4, 4]), 15);
        Assert.Equal(Math.E, BuiltinFunctions.Apply("exp", [1]), 15);
        Assert.Equal(1.0, BuiltinFunctions.Apply("log", [Math.E]), 15); // natural logarithm
        Assert.Equal(3.0, BuiltinFunctions.Apply("sqrt", [9]));
        Assert.Equal(8.0, BuiltinFunctions.Apply("pow", [2, 3]));
        Assert.Equal(-1.0, BuiltinFunctions.Apply("min", [-1, 2]));
        Assert.Equal(2.0, BuiltinFunctions.Apply("max", [-1, 2]));
        Assert.Equal(1.5, BuiltinFunctions.Apply("abs", [-1.5]));
        Assert.Equal(1.0, BuiltinFunctions.Apply("sin", [Math.PI / 2]), 15); // radians
        Assert.Equal(-1.0, BuiltinFunctions.Apply("cos", [Math.PI]), 15);
        Assert.Throws<ArgumentException>(() => BuiltinFunctions.Apply("mm", [1]));
    }
}
