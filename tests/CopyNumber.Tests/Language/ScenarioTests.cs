using CopyNumber.Language;
using static CopyNumber.Tests.Language.LanguageTestSupport;

namespace CopyNumber.Tests.Language;

// The bundled scenarios parse, have the structure their header comments promise, and their
// illustrative values do what the comments say, checked by calculations done here.
public sealed class ScenarioTests
{
    private static ModelSyntax Load(string name)
    {
        var outcome = ModelSource.ReadFile(Path.Combine(ScenariosFolder(), name));
        Assert.True(outcome.Succeeded, string.Join("\n", outcome.Diagnostics.Select(d => d.Format())));
        return outcome.Model!;
    }

    [Fact]
    public void EveryScenarioParsesAndSaysItsValuesAreIllustrative()
    {
        var files = ScenarioFiles();
        Assert.Equal(["bursty_gene_cells.cnet", "dividing_gene_cells.cnet", "inducer_pulse.cnet", "promoter_switch.cnet", "repressor_dimer.cnet", "ring_oscillator.cnet", "toggle_pair.cnet"],
            files.Select(Path.GetFileName));
        foreach (var file in files)
        {
            Load(Path.GetFileName(file));
            var header = string.Concat(File.ReadLines(file).TakeWhile(l => l.StartsWith('#')));
            Assert.Contains("illustrative", header);
            Assert.Contains("not measured", header);
        }
    }

    [Fact]
    public void BurstyGeneCellsHasTheMeansItsHeaderStates()
    {
        // Without the inducer cycle (depth 0) and at the mean burst frequency the network is first order, so
        // the mean equations are exact: <on> = k_on/(k_on + k_off), <m> = k_burst·<on>·b/d_m (mean burst size
        // b; Friedman, Cai & Xie 2006), <p> = k_tl·<m>/d_p.
        var model = Load("bursty_gene_cells.cnet");
        var values = ParameterValues(model);
        var burst = model.Reactions.Single(r => r.Name == "transcribe").Products.Terms.Single(t => t.BurstMean is not null);
        Assert.Equal("mrna", burst.Species);
        Assert.Equal("gamma", model.Parameters.Single(p => p.Name == "k_burst").Varies!.Law);
        var onFraction = values["k_on"] / (values["k_on"] + values["k_off"]);
        var meanMrna = Constant(model, "transcribe") * onFraction * values["b_mrna"] / Constant(model, "mrna_decay");
        Assert.Equal(0.5, onFraction, 12);
        Assert.Equal(32, meanMrna, 9);
        Assert.Equal(320, Constant(model, "translate") * meanMrna / Constant(model, "prot_decay"), 9);
    }

    [Fact]
    public void DividingGeneCellsHasTheRatesItsHeaderStates()
    {
        // Per gene copy: bursts at k_burst·<on> with <on> = k_on/(k_on + k_off) (telegraph model; Peccoud & Ycart 1995,
        // quoted from memory) of mean size b: 2.5 mRNAs per minute; mRNA lifetime 1/d = 10 minutes; no protein decay.
        var model = Load("dividing_gene_cells.cnet");
        var values = ParameterValues(model);
        var onFraction = values["k_on"] / (values["k_on"] + values["k_off"]);
        Assert.Equal(2.5, Constant(model, "transcribe") * onFraction * values["b_mrna"], 12);
        Assert.Equal(10, 1 / Constant(model, "mrna_decay"), 12);
        Assert.DoesNotContain(model.Reactions, r => r.Reactants.Terms.Any(t => t.Species == "protein"));
        var cycle = model.Cycle!;
        Assert.Equal(("exponential", "binomial"), (cycle.Growth, cycle.Split));
        Assert.Equal(["g_off", "g_on"], cycle.Genes.Select(g => g.Name));
        Assert.Null(cycle.LengthCv);
    }

    [Fact]
    public void PromoterSwitchHasTheTelegraphMeansItsHeaderStates()
    {
        var model = Load("promoter_switch.cnet");
        Assert.Equal(["g_off", "g_on", "mrna", "protein"], model.Species.Select(s => s.Name));
        Assert.Equal(6, model.Reactions.Count);
        Assert.All(model.Reactions, r => Assert.Equal(LawKind.Mass, r.Law));
        Assert.All(model.Reactions, r => Assert.False(r.Reversible));
        AssertConserved(model, new() { ["g_off"] = 1, ["g_on"] = 1 }, expectedTotal: 1);

        // Gene on/off with transcription from the on state only (the "telegraph" model): the mean
        // equations of a first-order network are exact, giving <on> = k_on/(k_on + k_off),
        // <m> = k_tx <on>/d_m and <p> = k_tl <m>/d_p (Peccoud & Ycart 1995, Theor. Popul. Biol. 48:222;
        // quoted from memory).
        double K(string reaction) => Constant(model, reaction);
        var onFraction = K("promoter_on") / (K("promoter_on") + K("promoter_off"));
        var meanMrna = K("transcription") * onFraction / K("mrna_decay");
        var meanProtein = K("translation") * meanMrna / K("protein_decay");
        Assert.Equal(0.5, onFraction, 12);
        Assert.Equal(30, meanMrna, 9);
        Assert.Equal(300, meanProtein, 9);
    }

    [Fact]
    public void RepressorDimerConservesItsOperatorAndTranscribesOnlyFromTheFreeOperator()
    {
        var model = Load("repressor_dimer.cnet");
        AssertConserved(model, new() { ["O"] = 1, ["OD"] = 1 }, expectedTotal: 1);

        var dimerise = model.Reactions.Single(r => r.Reactants.Terms is [{ Coefficient: 2, Species: "R" }]);
        Assert.True(dimerise.Reversible);
        Assert.NotNull(dimerise.Reverse);
        Assert.Equal([(1L, "D")], dimerise.Products.Terms.Select(t => (t.Coefficient, t.Species)));
        var bind = model.Reactions.Single(r => r.Products.Terms is [{ Coefficient: 1, Species: "OD" }]);
        Assert.True(bind.Reversible);
        Assert.Equal(["D", "O"], bind.Reactants.Terms.Select(t => t.Species).Order());

        // The only source of mRNA needs the free operator and gives it back.
        var madeM = model.Reactions.Where(r => Net(r, "M") > 0).ToList();
        var transcription = Assert.Single(madeM);
        Assert.Equal([(1L, "O")], transcription.Reactants.Terms.Select(t => (t.Coefficient, t.Species)));
        Assert.Equal(0, Net(transcription, "O"));

        // total_repressor = R + 2 D + 2 OD counts monomers, so binding and dimerising leave it unchanged.
        var total = model.Readouts.Single(r => r.Name == "total_repressor");
        Assert.Equal("((R + (2 * D)) + (2 * OD))", Show(total.Value));
        var weights = new Dictionary<string, long> { ["R"] = 1, ["D"] = 2, ["OD"] = 2 };
        foreach (var reaction in new[] { dimerise, bind })
            Assert.Equal(0, weights.Sum(w => w.Value * Net(reaction, w.Key)));
    }

    [Fact]
    public void TogglePairIsBistableAtLowCopyNumbers()
    {
        // Mutual repression with cooperative Hill functions has two stable states and a saddle for
        // strong enough synthesis (Gardner, Cantor & Collins 2000, Nature 403:339; quoted from memory).
        // Here the steady states of the rate equations are counted directly: with V at its own steady
        // state for a given U, V*(U) = make_v(U)/d_v, the steady states are the roots of
        // F(U) = make_u(V*(U)) - d_u U.
        var model = Load("toggle_pair.cnet");
        Assert.All(model.Reactions.Where(r => r.Name.StartsWith("make")), r => Assert.Equal(LawKind.Rate, r.Law));
        var parameters = ParameterValues(model);
        var makeU = model.Reactions.Single(r => r.Name == "make_u");
        var makeV = model.Reactions.Single(r => r.Name == "make_v");
        var decayU = Constant(model, "decay_u");
        var decayV = Constant(model, "decay_v");
        Assert.Contains("hill_rep", Show(makeU.Forward));

        double Law(ReactionDecl r, double u, double v) => ConstantEvaluator.Evaluate(r.Forward,
            name => name switch { "U" => u, "V" => v, "size" => model.Size, _ => parameters[name] })!.Value;
        double F(double u) => Law(makeU, u, Law(makeV, u, 0) / decayV) - decayU * u;

        var roots = new List<double>();
        for (var u = 0.0; u < 200; u += 0.01)
            if (Math.Sign(F(u)) != Math.Sign(F(u + 0.01))) roots.Add(u);
        Assert.Equal(3, roots.Count);
        Assert.InRange(roots[^1], 10, 99); // the high state holds tens of copies
        Assert.InRange(roots[0], 0.5, 10);
        // The header comment quotes (26.2, 3.8), (3.8, 26.2) and a saddle near 12.1.
        Assert.Equal(3.8, roots[0], 1);
        Assert.Equal(12.1, roots[1], 1);
        Assert.Equal(26.2, roots[2], 1);
    }

    [Fact]
    public void InducerPulseRaisesAParameterThenHalvesASpecies()
    {
        var model = Load("inducer_pulse.cnet");
        Assert.NotEqual(1.0, model.Size);
        var parameters = ParameterValues(model);
        Assert.Equal(2, model.Schedule.Count);

        var raise = model.Schedule[0];
        Assert.Equal(50, ((NumberExpr)raise.Time).Value);
        Assert.Equal(ScheduleOperation.Set, raise.Operation);
        Assert.Contains(model.Parameters, p => p.Name == raise.Target);
        Assert.True(ConstantEvaluator.Evaluate(raise.Value, n => parameters[n]) > parameters[raise.Target]);

        var halve = model.Schedule[1];
        Assert.Equal(100, ((NumberExpr)halve.Time).Value);
        Assert.Equal(ScheduleOperation.Set, halve.Operation);
        Assert.Contains(model.Species, s => s.Name == halve.Target);
        Assert.Equal($"({halve.Target} / 2)", Show(halve.Value));
        Assert.NotEmpty(model.Readouts);
    }

    [Fact]
    public void TheWorkedExampleOfTheReferenceParsesAsDescribed()
    {
        // docs/network-language.md: the first code block is the worked example; its text below it
        // describes two species, three reaction lines (one reversible), two schedule lines, two readouts.
        var doc = File.ReadAllText(Path.Combine(ScenariosFolder(), "..", "docs", "network-language.md"));
        var start = doc.IndexOf("```\n", StringComparison.Ordinal) + 4;
        var example = doc[start..doc.IndexOf("```", start, StringComparison.Ordinal)];
        var model = ParseValid(example);
        Assert.Equal(["A", "B"], model.Species.Select(s => s.Name));
        Assert.Equal(["make", "pair", "loss"], model.Reactions.Select(r => r.Name));
        Assert.True(model.Reactions[1].Reversible);
        Assert.Equal([(2L, "A")], model.Reactions[1].Reactants.Terms.Select(t => (t.Coefficient, t.Species)));
        Assert.Equal(["k_make", "A"], model.Schedule.Select(s => s.Target));
        Assert.Equal(2, model.Readouts.Count);
    }

    private static long Net(ReactionDecl reaction, string species) =>
        reaction.Products.Terms.Where(t => t.Species == species).Sum(t => t.Coefficient)
        - reaction.Reactants.Terms.Where(t => t.Species == species).Sum(t => t.Coefficient);

    // A linear combination w·x is conserved when w·N = 0 (common practice); reversible lines have
    // opposite columns, so checking the forward direction suffices.
    private static void AssertConserved(ModelSyntax model, Dictionary<string, long> weights, long expectedTotal)
    {
        foreach (var reaction in model.Reactions)
            Assert.True(weights.Sum(w => w.Value * Net(reaction, w.Key)) == 0, $"reaction '{reaction.Name}' changes the conserved total");
        Assert.Equal(expectedTotal, model.Species.Where(s => weights.ContainsKey(s.Name)).Sum(s => weights[s.Name] * s.InitialCount));
    }

    private static Dictionary<string, double> ParameterValues(ModelSyntax model)
    {
        var values = new Dictionary<string, double>();
        foreach (var p in model.Parameters)
            values[p.Name] = ConstantEvaluator.Evaluate(p.Value, n => n == "size" ? model.Size : values[n])!.Value;
        return values;
    }

    private static double Constant(ModelSyntax model, string reaction)
    {
        var values = ParameterValues(model);
        var decl = model.Reactions.Single(r => r.Name == reaction);
        Assert.Equal(LawKind.Mass, decl.Law);
        return ConstantEvaluator.Evaluate(decl.Forward, n => n == "size" ? model.Size : values[n])!.Value;
    }
}
