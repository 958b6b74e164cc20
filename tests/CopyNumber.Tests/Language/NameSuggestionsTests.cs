using CopyNumber.Language;

namespace CopyNumber.Tests.Language;

public sealed class NameSuggestionsTests
{
    [Theory]
    // The textbook Levenshtein example: kitten -> sitten -> sittin -> sitting (common practice).
    [InlineData("kitten", "sitting", 3)]
    [InlineData("protien", "protein", 1)] // one swap of neighbours
    [InlineData("", "abc", 3)]
    [InlineData("same", "same", 0)]
    // Optimal string alignment edits each substring once, so "ca" -> "abc" costs 3, where the
    // unrestricted Damerau-Levenshtein distance is 2 (Wikipedia, "Damerau-Levenshtein distance";
    // quoted from memory).
    [InlineData("ca", "abc", 3)]
    public void DistanceCountsEditsAndNeighbourSwaps(string a, string b, int expected)
    {
        Assert.Equal(expected, NameSuggestions.Distance(a, b));
        Assert.Equal(expected, NameSuggestions.Distance(b, a));
    }

    [Fact]
    public void ClosestPrefersCaseSlipsAndSkipsFarOrTrivialMatches()
    {
        Assert.Equal("Protein", NameSuggestions.Closest("protein", ["protean", "Protein"]));
        Assert.Equal("mrna", NameSuggestions.Closest("mrnaa", ["protein", "mrna"]));
        Assert.Null(NameSuggestions.Closest("x", ["y"]));          // one letter replaced is not a typo
        Assert.Null(NameSuggestions.Closest("zebra", ["protein", "k"]));
        Assert.Null(NameSuggestions.Closest(new string('a', 100), [new string('a', 99)])); // long names are not compared
        Assert.Equal("k_on", NameSuggestions.Closest("k_no", ["k_off", "k_on"]));
    }
}
