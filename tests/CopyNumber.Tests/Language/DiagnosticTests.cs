using CopyNumber.Language;
using static CopyNumber.Tests.Language.LanguageTestSupport;

namespace CopyNumber.Tests.Language;

// One test per class of mistake: where the report points (line, column) and the words that make it
// useful. The expected places are counted by hand in each model text (line 1 is its first line).
public sealed class DiagnosticTests
{
    // A valid model that each test breaks in one place.
    private static string Model(string species = "protein = 10\n  dimer = 0", string parameters = "k = 0.5",
        string reactions = "bind: 2 protein -> dimer mass k", string extra = "") => $"""
        species
          {species}
        parameters
          {parameters}
        reactions
          {reactions}
        {extra}
        """;

    [Fact]
    public void TheBaseModelIsValid() => ParseValid(Model());

    [Fact]
    public void UnknownSpeciesSuggestsTheClosestSpecies() =>
        // line 7 "  bind: 2 protien -> dimer mass k": the name starts at column 11
        AssertSingleError(Model(reactions: "bind: 2 protien -> dimer mass k"), 7, 11,
            "unknown species 'protien'", "did you mean 'protein'?");

    [Fact]
    public void UnknownNameInALawSuggestsOnlyNamesAllowedThere()
    {
        // In a mass-action constant species are not allowed, so 'dimr' must not be matched to 'dimer'.
        var diagnostic = AssertSingleError(Model(reactions: "bind: 2 protein -> dimer mass dimr"), 7, 33, "unknown name 'dimr'");
        Assert.DoesNotContain("did you mean", diagnostic.Message);
        AssertSingleError(Model(reactions: "bind: 2 protein -> dimer rate kk * protein"), 7, 33,
            "unknown name 'kk'", "did you mean 'k'?");
    }

    [Fact]
    public void UnknownNameWithoutAnyCloseCandidateHasNoSuggestion()
    {
        var diagnostic = AssertSingleError(Model(reactions: "bind: 2 protein -> dimer rate zebra"), 7, 33, "unknown name 'zebra'");
        Assert.DoesNotContain("did you mean", diagnostic.Message);
    }

    [Fact]
    public void DuplicateNamePointsToTheEarlierDeclaration()
    {
        // species and parameters share one namespace
        AssertSingleError(Model(parameters: "k = 0.5\n  protein = 2"), 6, 3,
            "duplicate name 'protein'", "line 2", "a species");
        AssertSingleError(Model(species: "protein = 10\n  dimer = 0\n  dimer = 1"), 4, 3,
            "duplicate name 'dimer'", "line 3");
    }

    [Fact]
    public void DuplicateReactionNameIncludesTheExpandedReversibleNames()
    {
        AssertSingleError(Model(reactions: "bind: 2 protein -> dimer mass k\n  bind: dimer -> 0 mass k"), 8, 3,
            "duplicate reaction name 'bind'", "line 7");
        AssertSingleError(Model(reactions: "bind: 2 protein -> dimer mass k  back mass k\n  bind_rev: dimer -> 0 mass k"), 8, 3,
            "duplicate reaction name 'bind_rev'", "line 7", "reverse half of reversible reaction 'bind'");
        AssertSingleError(Model(reactions: "bind_fwd: dimer -> 0 mass k\n  bind: 2 protein -> dimer rate k * protein  back mass k"), 8, 3,
            "duplicate reaction name 'bind_fwd'", "line 7", "split into 'bind_fwd' and 'bind_rev'");
    }

    [Fact]
    public void ReactionNamesLiveApartFromSpeciesNames() =>
        ParseValid(Model(reactions: "dimer: 2 protein -> dimer mass k"));

    [Theory]
    [InlineData("k = 1.2.3", "malformed number '1.2.3'")]
    [InlineData("k = 3e", "malformed number '3e'")]
    [InlineData("k = 4e+", "malformed number '4e'")]
    [InlineData("k = 1e999", "number '1e999' is too large")]
    [InlineData("k = 2k", "malformed number '2k'", "write '2 k' with a space")]
    public void BadNumbersAreReportedAtTheNumber(string parameterLine, params string[] words) =>
        // line 5 is "  k = ..."; the number starts at column 7
        AssertSingleError(Model(parameters: parameterLine), 5, 7, words);

    [Theory]
    [InlineData("protein = -3", 13, "must not be negative", "'-3'")]
    [InlineData("protein = n0", 13, "non-negative number written as a number", "'n0'")]
    [InlineData("protein = 10 * 2", 16, "single non-negative number", "'held'", "'*'")]
    [InlineData("protein = 99999999999999999999", 13, "too large")]
    [InlineData("protein 10", 11, "'=' and an initial amount after species 'protein'")]
    [InlineData("protein = 10 hled", 16, "unknown word 'hled'", "did you mean 'held'?")]
    [InlineData("protein = 10 held held", 21, "single non-negative number")]
    public void InitialAmountsAreNonNegativeNumbers(string speciesLine, int column, params string[] words) =>
        AssertSingleError(Model(species: speciesLine + "\n  dimer = 0"), 2, column, words);

    [Theory]
    [InlineData("bind: 2 protein => dimer mass k", 19, "'=>' is not an arrow", "'->'", "'back'")]
    [InlineData("bind: 2 protein --> dimer mass k", 19, "'-->' is not an arrow")]
    [InlineData("bind: 2 protein <- dimer mass k", 19, "'<-' is not an arrow", "left to right")]
    [InlineData("bind: 2 protein <=> dimer mass k", 19, "'<=>' is not an arrow")]
    [InlineData("bind: 2 protein = dimer mass k", 19, "'=' is not an arrow")]
    [InlineData("bind: 2 protein dimer mass k", 19, "expected '+' or the arrow '->'", "'dimer'")]
    [InlineData("bind: 2 protein mass k", 19, "missing arrow", "'mass'")]
    public void MissingOrWrongArrowsAreNamed(string reaction, int column, params string[] words) =>
        AssertSingleError(Model(reactions: reaction), 7, column, words);

    [Theory]
    [InlineData("bind: 2 protein -> dimer", 27, "missing law", "'mass <constant>'", "'rate <expression>'")]
    [InlineData("bind: 2 protein -> dimer k", 28, "expected '+', 'mass' or 'rate'", "'k'")]
    [InlineData("bind: 2 protein -> dimer mas k", 28, "unknown law 'mas'", "did you mean 'mass'?")]
    [InlineData("bind: 2 protein -> mass k", 27, "missing products before 'mass'", "'0'")]
    public void MissingLawKeywordIsReported(string reaction, int column, params string[] words) =>
        AssertSingleError(Model(reactions: reaction), 7, column, words);

    [Theory]
    [InlineData("bind: 2 protein -> dimer rate hil_rep(protein, k, 2)", 33, "unknown function 'hil_rep'", "did you mean 'hill_rep'?")]
    [InlineData("bind: 2 protein -> dimer rate frobnicate(protein)", 33, "unknown function 'frobnicate'", "the functions are exp, log")]
    [InlineData("bind: 2 protein -> dimer rate k(protein)", 33, "'k' is not a function", "'*'")]
    [InlineData("bind: 2 protein -> dimer rate hill_rep(protein, k)", 33, "'hill_rep' takes 3 arguments", "hill_rep(x, K, n)", "given 2")]
    [InlineData("bind: 2 protein -> dimer rate exp()", 33, "'exp' takes 1 argument,", "given 0")]
    public void UnknownFunctionsAndWrongArgumentCountsAreReported(string reaction, int column, params string[] words) =>
        AssertSingleError(Model(reactions: reaction), 7, column, words);

    [Fact]
    public void MassActionConstantMayNotUseASpecies() =>
        AssertSingleError(Model(reactions: "bind: 2 protein -> dimer mass k * protein"), 7, 37,
            "mass-action constant may not depend on species 'protein'", "write a rate law instead");

    // The first edition's reversible forms are reported at the double arrow or the comma, with the whole
    // reaction rewritten in the second edition's form (the message quotes it exactly).
    [Theory]
    [InlineData("bind: 2 protein <-> dimer mass k, k", 19,
        "the double arrow '<->' is the first edition's form; write one arrow and the reverse law after 'back': 'bind: 2 protein -> dimer  mass k  back mass k'")]
    [InlineData("bind: 2 protein <-> dimer mass k", 19,
        "the double arrow '<->' is the first edition's form; write one arrow and the reverse law after 'back': 'bind: 2 protein -> dimer  mass k  back mass <reverse constant>'")]
    [InlineData("bind: 2 protein -> dimer mass 2 * k, k / 2", 38,
        "a second constant after ',' is the first edition's form of a reversible reaction; write the reverse law after 'back': 'bind: 2 protein -> dimer  mass 2 * k  back mass k / 2'")]
    [InlineData("bind: 2 protein <-> dimer rate k * protein, k", 19,
        "the double arrow '<->' is the first edition's form; write one arrow and the reverse law after 'back': 'bind: 2 protein -> dimer  rate k * protein  back rate k'")]
    public void FirstEditionReversibleFormsAreReportedWithTheNewForm(string reaction, int column, string message)
    {
        var diagnostic = AssertSingleError(Model(reactions: reaction), 7, column);
        Assert.Equal(message, diagnostic.Message);
    }

    [Fact]
    public void TheSuggestedReversibleLineParsesIntoTheSameReaction()
    {
        // The suggestion is a working line: pasted back in, it parses with the forward and reverse laws of the old one.
        var diagnostic = AssertSingleError(Model(reactions: "bind: 2 protein <-> dimer mass k, 2 * k"), 7, 19);
        var suggested = diagnostic.Message[(diagnostic.Message.IndexOf("'bind:", StringComparison.Ordinal) + 1)..^1];
        var model = ParseValid(Model(reactions: suggested));
        var reaction = Assert.Single(model.Reactions);
        Assert.True(reaction.Reversible);
        Assert.Equal("k", Assert.IsType<NameExpr>(reaction.Forward).Name);
        Assert.Equal('*', Assert.IsType<BinaryExpr>(reaction.Reverse).Operator);
    }

    [Theory]
    [InlineData("bind: 2 protein -> dimer mass k  back", 40, "'back' needs the reverse law")]
    [InlineData("bind: 2 protein -> dimer mass k  back k", 41, "expected 'mass' or 'rate' after 'back'", "'k'")]
    [InlineData("bind: 2 protein -> dimer mass k  back mas k", 41, "unknown law 'mas' after 'back'", "did you mean 'mass'?")]
    [InlineData("bind: 2 protein -> dimer mass k  back mass", 45, "the reverse mass-action constant is incomplete")]
    [InlineData("bind: 2 protein -> dimer mass k  back mass k k", 48, "unexpected 'k' after the reverse mass-action constant")]
    [InlineData("bind: 2 protein -> dimer mass k  back mass k * dimer", 50, "mass-action constant may not depend on species 'dimer'")]
    [InlineData("bind: 2 protein -> dimer back mass k", 28, "the forward law", "before 'back'")]
    [InlineData("bind: 2 protein -> dimer mass k  back mass -k", 46, "reverse mass-action constant of reaction 'bind' is negative")]
    public void BackClausesAreChecked(string reaction, int column, params string[] words) =>
        AssertSingleError(Model(reactions: reaction), 7, column, words);

    [Theory]
    [InlineData("time = 1", 6, 3, "'time' is a reserved name")]
    [InlineData("replicate = 1", 6, 3, "'replicate' is a reserved name")]
    [InlineData("size = 1", 6, 3, "'size' is a reserved name", "'size <number>'")]
    public void ReservedNamesCannotBeDeclared(string speciesLine, int line, int column, params string[] words) =>
        AssertSingleError(Model(parameters: "k = 0.5\n  " + speciesLine), line, column, words);

    [Fact]
    public void TimeMayAppearOnlyInRateLawsAndReplicateNowhere()
    {
        AssertSingleError(Model(reactions: "bind: 2 protein -> dimer mass k * time"), 7, 37,
            "mass-action constant may not depend on 'time'", "write a rate law");
        AssertSingleError(Model(parameters: "k = 2 * time"), 5, 11, "a parameter may not depend on 'time'", "at time T");
        AssertSingleError(Model(parameters: "k = replicate"), 5, 7, "'replicate'", "change line");
    }

    [Fact]
    public void SpeciesLineOutsideTheSpeciesSectionIsReported()
    {
        AssertSingleError("protein = 3\n" + Model(), 1, 1, "declaration of 'protein' before any section", "'species'");
        AssertSingleError(Model(reactions: "bind: 2 protein -> dimer mass k\n  monomer = 4"), 8, 3,
            "'monomer = ...' in the 'reactions' section", "species go under 'species'");
    }

    [Fact]
    public void UnknownSectionIsReportedWithASuggestion()
    {
        // A near miss is taken as the section it resembles, so its lines are still checked.
        AssertSingleError(Model().Replace("parameters", "paramters"), 4, 1, "unknown section 'paramters'", "did you mean 'parameters'?");
        // Lines under a header that names nothing are skipped without further reports.
        AssertSingleError(Model(extra: "outputs\n  anything = protein"), 8, 1, "unknown section 'outputs'", "the sections are");
        // A lone word is always read as a header; inside a declaring section the report says how to declare it.
        AssertSingleError(Model(species: "protein = 10\n  dimer = 0\n  monomer"), 4, 3,
            "unknown section 'monomer'", "a line holding a single word is a section header", "write 'monomer = ...'");
    }

    [Theory]
    [InlineData("k = 0.5 $ 2", 11, "unexpected character '$'")]
    [InlineData("k = 0.5;", 10, "unexpected character ';'", "one declaration per line")]
    [InlineData("k = \"0.5\"", 7, "unexpected character '\"'", "without quotes")]
    [InlineData("k = 0.5 . 2", 11, "unexpected character '.'")]
    [InlineData("k = 0.5 \u00b5", 11, "unexpected character '\u00b5'")]
    public void StrayCharactersAreReported(string parameterLine, int column, params string[] words) =>
        AssertSingleError(Model(parameters: parameterLine), 5, column, words);

    [Fact]
    public void AModelWithoutSpeciesOrReactionsIsAnError()
    {
        var outcome = ModelSource.Parse("parameters\n  k = 1\n", "empty.cnet");
        Assert.Equal(2, outcome.Diagnostics.Count);
        AssertDiagnostic(outcome.Diagnostics[0], 1, 1, "declares no species");
        AssertDiagnostic(outcome.Diagnostics[1], 1, 1, "has no reactions");
        // With an empty header present, the report points at the header.
        AssertSingleError("species\n  A = 1\nreactions\n", 3, 1, "has no reactions");
        Assert.Equal(2, ModelSource.Parse("", "empty.cnet").Diagnostics.Count);
    }

    [Fact]
    public void RepeatedSectionIsReportedAndItsLinesStillCount() =>
        // 'monomer' is declared under the repeated header and used by 'split' without complaint.
        AssertSingleError(Model(reactions: "bind: 2 protein -> dimer mass k\n  split: dimer -> 2 monomer mass k", extra: "species\n  monomer = 2"), 9, 1,
            "section 'species' appears twice", "line 1");

    [Theory]
    [InlineData("size 0", 6, "system size must be a positive number")]
    [InlineData("size -2", 6, "system size must be a positive number")]
    [InlineData("size 2 * 3", 8, "unexpected '*'")]
    [InlineData("size big", 6, "expected a positive number after 'size'")]
    public void SizeMustBeOnePositiveNumber(string sizeLine, int column, params string[] words) =>
        AssertSingleError(sizeLine + "\n" + Model(), 1, column, words);

    [Fact]
    public void SizeMayBeSetOnlyOnce() =>
        AssertSingleError("size 2\n" + Model(extra: "size 3"), 9, 1, "system size is set twice", "line 1");

    [Fact]
    public void ParametersUseOnlyNumbersEarlierParametersAndSize()
    {
        AssertSingleError(Model(parameters: "k = 2 * k2\n  k2 = 1"), 5, 11, "parameter 'k2' is defined further down (line 6)");
        AssertSingleError(Model(parameters: "k = 2 * k"), 5, 11, "'k' is used in its own definition");
        AssertSingleError(Model(parameters: "k = protein / size"), 5, 7, "parameter 'k' may not depend on species 'protein'");
        ParseValid(Model(parameters: "k0 = 2 * size\n  k = k0 / 4"));
    }

    [Fact]
    public void ParametersThatAreNotFiniteNumbersAreReported() =>
        AssertSingleError(Model(parameters: "k = 1 / (size - 1)"), 5, 7, "parameter 'k' is infinite", "division by zero");

    [Fact]
    public void NegativeMassActionConstantIsReported() =>
        AssertSingleError(Model(parameters: "k = -0.5"), 7, 33, "mass-action constant of reaction 'bind' is negative", "-0.5");

    [Theory]
    [InlineData("protein = 1  at time -5", 24, "change time must not be negative", "-5")]
    [InlineData("protein = 1  at time 1 - 4 * k", 24, "change time must not be negative", "-1")]
    [InlineData("protein = 1  at time protein", 24, "change time may not depend on species 'protein'", "'whenever'")]
    [InlineData("k += 1  at time 5", 3, "parameter 'k' can only be set with '='", "'+='")]
    [InlineData("protien = 1  at time 5", 3, "unknown change target 'protien'", "did you mean 'protein'?")]
    [InlineData("size = 1  at time 5", 3, "system size cannot be changed")]
    [InlineData("total = 1  at time 5", 3, "readout 'total' cannot be changed")]
    [InlineData("protein = 2 * protien  at time 5", 17, "unknown name 'protien'", "did you mean 'protein'?")]
    [InlineData("protein = 1  at 5", 19, "expected 'time' after 'at'", "'5'")]
    [InlineData("protein = 1", 14, "a change needs its timing", "'at time <time>'", "'every <period>'", "'whenever <condition>'")]
    [InlineData("protein = 1  evry 5", 16, "unknown timing 'evry'", "did you mean 'every'?")]
    [InlineData("protein * 2  at time 5", 11, "expected '=', '+=' or '-=' after 'protein'")]
    [InlineData("protein = 1,  at time 5", 14, "a ',' before the timing", "remove it or add another assignment")]
    [InlineData("protein = 1  every 0", 22, "period of a repeating change must be positive", "0")]
    [InlineData("protein = 1, dimer = 2  every -3", 33, "period of a repeating change must be positive", "-3")]
    [InlineData("protein = 1, dimer = 2  at time -3", 35, "change time must not be negative", "-3")]
    [InlineData("protein = 1  every 5 from -1", 29, "first time of the repeating change must not be negative")]
    [InlineData("protein = 1  every 5 from 10 until 3", 38, "last time of the repeating change (3) is before its first time (10)")]
    [InlineData("protein = 1  every 5 until 20 from 10", 33, "unexpected 'from' after the last time")]
    [InlineData("protein = 1  whenever protein >", 34, "the condition is incomplete")]
    [InlineData("protein = 1  whenever protien > 3", 25, "unknown name 'protien'", "did you mean 'protein'?")]
    [InlineData("protein = 1  whenever total > 3", 25, "readout 'total' cannot be used in a condition")]
    [InlineData("protein = 1  whenever time > 3", 25, "a condition may not depend on 'time'; only rate laws may")]
    [InlineData("protein = 1  whenever 1 < protein < 3", 37, "comparisons do not chain")]
    [InlineData("protein = 1  whenever protein ! 3", 33, "write 'not' to negate a condition", "'!='")]
    [InlineData("protein = 1  whenever protein > 3 && dimer < 2", 37, "write 'and' and 'or'")]
    [InlineData("protein = 1  whenever protein + not dimer > 2", 35, "'not' applies to a whole condition", "'(not A > 3)'")]
    public void ChangeLinesAreChecked(string changeLine, int column, params string[] words)
    {
        // the change line is line 9; readouts come after it
        var text = Model(extra: $"changes\n  {changeLine}\nreadouts\n  total = protein + 2*dimer");
        AssertSingleError(text, 9, column, words);
    }

    [Fact]
    public void AReadoutIsNotSuggestedAsAChangeTarget()
    {
        var text = Model(extra: "changes\n  tota = 1  at time 5\nreadouts\n  total = protein + 2*dimer");
        var diagnostic = AssertSingleError(text, 9, 3, "unknown change target 'tota'");
        Assert.DoesNotContain("did you mean", diagnostic.Message);
    }

    // The first edition's schedule is reported at its header and at each line, with the line rewritten as
    // what, then when (the message quotes it exactly).
    [Fact]
    public void FirstEditionScheduleLinesAreReportedWithTheNewForm()
    {
        var outcome = ModelSource.Parse(Model(extra: "schedule\n  at 5: protein += 4\n  at 2*k: k = k / 2"), "old.cnet");
        Assert.Null(outcome.Model);
        Assert.Equal(3, outcome.Diagnostics.Count);
        AssertDiagnostic(outcome.Diagnostics[0], 8, 1, "the 'schedule' section is the first edition's form", "header 'changes'");
        Assert.Equal((9, 3), (outcome.Diagnostics[1].Position.Line, outcome.Diagnostics[1].Position.Column));
        Assert.Equal("a change line opening with 'at' is the first edition's form; write what, then when: 'protein += 4  at time 5'",
            outcome.Diagnostics[1].Message);
        Assert.Equal((10, 3), (outcome.Diagnostics[2].Position.Line, outcome.Diagnostics[2].Position.Column));
        Assert.Equal("a change line opening with 'at' is the first edition's form; write what, then when: 'k = k / 2  at time 2*k'",
            outcome.Diagnostics[2].Message);
    }

    [Theory]
    [InlineData("time unit", 10, "expected a unit name after 'time unit'")]
    [InlineData("time unit minute second", 18, "unexpected 'second' after the time unit")]
    [InlineData("time unit minute\ntime unit hour", 11, "the time unit is declared twice", "'minute'")]
    [InlineData("size unit 3", 11, "expected a unit name after 'size unit'")]
    public void UnitLinesAreChecked(string lines, int column, params string[] words)
    {
        var diagnostic = AssertSingleError(lines + "\n" + Model().Trim(), lines.Count(c => c == '\n') + 1, column, words);
        Assert.NotNull(diagnostic);
    }

    [Fact]
    public void ReadoutsMayNotUseReadouts()
    {
        AssertSingleError(Model(extra: "readouts\n  total = protein + 2*dimer\n  twice = 2 * total"), 10, 15,
            "readout 'twice' may not use another readout ('total')");
        AssertSingleError(Model(reactions: "bind: 2 protein -> dimer rate total", extra: "readouts\n  total = protein + 2*dimer"), 7, 33,
            "readout 'total' cannot be used in a rate law");
    }

    [Fact]
    public void ReactionAndScheduleLinesOutsideTheirSections()
    {
        AssertSingleError(Model(parameters: "k = 0.5\n  decay: dimer -> 0 mass k"), 6, 3, "reaction line in the 'parameters' section");
        AssertSingleError(Model(parameters: "k = 0.5\n  at 5: k = 1"), 6, 3, "change line in the 'parameters' section");
        AssertSingleError(Model(parameters: "k = 0.5\n  k = 1  at time 5"), 6, 3, "change line in the 'parameters' section", "'changes'");
        AssertSingleError(Model(species: "protein = 10\n  dimer = 0  every 5"), 3, 3, "change line in the 'species' section");
    }

    [Theory]
    [InlineData("k = (1 + 2", 13, "missing ')'", "column 7")]
    [InlineData("k = 1 + 2)", 12, "unmatched ')'")]
    [InlineData("k = 1 +", 10, "incomplete")]
    [InlineData("k = 1 * * 2", 11, "expected a number, a name or '('", "'*'")]
    [InlineData("k = 2 k", 9, "unexpected 'k'", "operator missing")]
    [InlineData("k = max(1, 2", 15, "missing ')' to close the call of 'max'")]
    [InlineData("k 0.5", 5, "'=' after parameter 'k'", "'0.5'")]
    public void MalformedExpressionsAreReported(string parameterLine, int column, params string[] words) =>
        AssertSingleError(Model(parameters: parameterLine), 5, column, words);

    [Fact]
    public void DeepNestingIsRefusedInsteadOfExhaustingTheStack()
    {
        var nested = new string('(', 5000) + "1" + new string(')', 5000);
        AssertSingleError(Model(parameters: "k = " + nested), 5, 107, "nested too deeply");
        var signs = new string('-', 5000) + "1";
        AssertSingleError(Model(parameters: "k = " + signs), 5, 107, "nested too deeply");
        var longSum = string.Join(" + ", Enumerable.Repeat("1", 5000));
        // the 1001st node is the '+' that joins the 501st term
        AssertSingleError(Model(parameters: "k = " + longSum), 5, 5 + 4 * 500, "expression too long");
    }

    [Theory]
    [InlineData("bind: 0 protein -> dimer mass k", 9, "positive integer", "'0'")]
    [InlineData("bind: 2.5 protein -> dimer mass k", 9, "positive integer", "'2.5'")]
    [InlineData("bind: 0 + protein -> dimer mass k", 9, "'0' is the empty side")]
    [InlineData("bind: 2 -> dimer mass k", 11, "expected a species after the coefficient '2'")]
    [InlineData("bind: -> dimer mass k", 9, "missing reactants before '->'")]
    [InlineData("bind: 2 protein + -> dimer mass k", 21, "expected a species in the reactants", "'->'")]
    [InlineData("bind: 2 protein -> k mass k", 22, "'k' is a parameter (line 5), not a species")]
    public void ReactionSidesAreChecked(string reaction, int column, params string[] words) =>
        AssertSingleError(Model(reactions: reaction), 7, column, words);

    [Theory]
    [InlineData("2 protein -> dimer mass k", 3, "missing reaction name")]
    [InlineData("bind 2 protein -> dimer mass k", 8, "expected ':' after the reaction name 'bind'")]
    public void ReactionLinesStartWithANameAndAColon(string reaction, int column, params string[] words) =>
        AssertSingleError(Model(reactions: reaction), 7, column, words);

    [Theory]
    [InlineData("species:", 8, "without ':'")]
    [InlineData("species protein = 10", 9, "must stand alone on its line")]
    public void SectionHeadersStandAlone(string header, int column, params string[] words) =>
        AssertSingleError(Model().Replace("species\n", header + "\n"), 1, column, words);

    [Fact]
    public void EveryMistakeOfAFileIsReportedAtOnceInLineOrder()
    {
        var text = """
            species
              A = 10
              B = -1
            parameters
              k = 1 +
            reactions
              r1: A => B mass k
              r2: A -> C mass k
              r3: A -> B rate hil_act(A, 1, 2)
            """;
        var outcome = ModelSource.Parse(text, "many.cnet");
        Assert.Null(outcome.Model);
        Assert.Equal(5, outcome.Diagnostics.Count);
        AssertDiagnostic(outcome.Diagnostics[0], 3, 7, "must not be negative");
        AssertDiagnostic(outcome.Diagnostics[1], 5, 10, "incomplete");
        AssertDiagnostic(outcome.Diagnostics[2], 7, 9, "'=>' is not an arrow");
        AssertDiagnostic(outcome.Diagnostics[3], 8, 12, "unknown species 'C'");
        AssertDiagnostic(outcome.Diagnostics[4], 9, 19, "unknown function 'hil_act'", "did you mean 'hill_act'?");
    }

    [Fact]
    public void NamesOnBrokenLinesDoNotCauseFollowOnReports()
    {
        // 'B' and 'k' are declared on lines with mistakes; their uses further down are not reported again.
        var outcome = ModelSource.Parse("species\n  A = 1\n  B = -2\nparameters\n  k = (1\nreactions\n  r: A -> B mass k\n", "x.cnet");
        Assert.Equal([3, 5], outcome.Diagnostics.Select(d => d.Position.Line));
    }

    [Fact]
    public void FormatShowsFileLineColumnTheLineAndACaret()
    {
        var diagnostic = AssertSingleError(Model(reactions: "bind: 2 protien -> dimer mass k"), 7, 11, "protien");
        Assert.Equal(
            "test.cnet:7:11: error: unknown species 'protien'; did you mean 'protein'?\n" +
            "    bind: 2 protien -> dimer mass k\n" +
            "            ^^^^^^^",
            diagnostic.Format());
    }

    [Fact]
    public void MissingOrUnreadableFilesAreDiagnosticsNotExceptions()
    {
        var missing = Path.Combine(Path.GetTempPath(), "copynumber-no-such-file-" + Guid.NewGuid() + ".cnet");
        var outcome = ModelSource.ReadFile(missing);
        var diagnostic = Assert.Single(outcome.Diagnostics);
        AssertDiagnostic(diagnostic, 1, 1, "not found");
        Assert.Equal(missing, diagnostic.File);

        AssertDiagnostic(Assert.Single(ModelSource.ReadFile(Path.GetTempPath()).Diagnostics), 1, 1, "is a directory");
        AssertDiagnostic(Assert.Single(ModelSource.ReadFile("").Diagnostics), 1, 1, "no model file");
    }

    [Fact]
    public void ReadFileParsesAnExistingFile()
    {
        var path = Path.Combine(Path.GetTempPath(), "copynumber-read-" + Guid.NewGuid() + ".cnet");
        File.WriteAllText(path, "\uFEFFspecies\n  A = 1\nreactions\n  r: A -> 0 mass 1\n");
        try
        {
            var outcome = ModelSource.ReadFile(path);
            Assert.True(outcome.Succeeded);
            Assert.Equal(path, outcome.Model!.File);
        }
        finally
        {
            File.Delete(path);
        }
    }
}
