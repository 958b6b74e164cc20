using CopyNumber.Kinetics;
using CopyNumber.Language;

namespace CopyNumber.Network;

/// <summary>
/// The <c>cycle</c> section compiled: the cell's volume V(t) put where the laws use the size, and the
/// cycle's settings checked (docs/network-language.md "cycle"; docs/methods.md "Growth and division").
/// </summary>
public static partial class NetworkCompiler
{
    private sealed partial class Compilation
    {
        // The propensities that a cell cycle made read time through V(t), by column, for the thinning bounds.
        private readonly Dictionary<Column, Expr> _growingLaws = new(ReferenceEqualityComparer.Instance);
        private readonly List<Diagnostic> _cycleWarnings = [];

        private double CycleLength(CellCycleDecl cycle)
        {
            var length = double.NaN;
            Guard(() => length = Evaluate(cycle.Length, ParameterOrSize, "the cycle length"));
            if (!double.IsNaN(length) && !(length > 0 && double.IsFinite(length)))
                Report(cycle.Lines.GetValueOrDefault("length", cycle.Position), $"the cycle length must be a positive finite number, not {Describe(length)}");
            return length;
        }

        private CellCycle? CompileCycle(CellCycleDecl cycle)
        {
            var cv = 0.0;
            var lengthLine = cycle.Lines.GetValueOrDefault("length", cycle.Position);
            if (cycle.LengthCv is { } cvExpr && Guard(() => cv = Evaluate(cvExpr, ParameterOrSize, "the cycle length's coefficient of variation"))
                && !(cv >= 0 && double.IsFinite(cv)))
                Report(lengthLine, $"the cycle length's coefficient of variation must be zero or more and finite, not {Describe(cv)}");
            var phase = double.NaN;
            var genesLine = cycle.Lines.GetValueOrDefault("genes", cycle.Position);
            if (cycle.GenePhase is { } phaseExpr && Guard(() => phase = Evaluate(phaseExpr, ParameterOrSize, "the phase at which the genes double"))
                && !(phase >= 0 && phase < 1))
                Report(genesLine, $"the phase at which the genes double is a fraction of the cycle, 0 or more and below 1, not {Describe(phase)}");
            var genes = new List<int>();
            foreach (var (name, position) in cycle.Genes)
            {
                var species = _scope.SpeciesIndex(name);
                if (species < 0) Report(position, $"unknown species '{name}' among the genes");
                else if (model.Species[species].Fixed) Report(position, $"gene species '{name}' is held, so its copies cannot double");
                else if (genes.Contains(species)) Report(position, $"gene species '{name}' is named twice");
                else genes.Add(species);
            }
            if (_diagnostics.Count > 0) return null;
            var birthSlot = _scope.ParameterIndex(CellCycle.BirthName);
            return new CellCycle(
                cycle.Growth == "linear" ? CellGrowth.Linear : CellGrowth.Exponential,
                _parameterValues[birthSlot + 1], cv, [.. genes], genes.Count > 0 ? phase : double.NaN,
                cycle.Split == "halves" ? CellSplit.Halves : CellSplit.Binomial,
                birthSlot, birthSlot + 1, cycle.Position, [.. _cycleWarnings]);
        }

        /// <summary>
        /// The kinetics of a column in a growing cell, or null when the volume does not enter it (a first-order
        /// mass-action reaction whose constant does not name <c>size</c>, or a rate law that does not name it).
        /// </summary>
        private ColumnKinetics? GrowingKinetics(Column column)
        {
            var volume = Volume(model.Cycle!, column.Position);
            var expanded = _scope.Expand(column.LawExpression);
            var readsSize = ExpressionGraph.NamesUsed(expanded).Contains(ExpressionScope.SizeName);
            if (column.Law == LawKind.Rate)
            {
                if (readsSize) return Growing(column, Substitute(expanded, volume), Substitute(expanded, volume));
                WarnIfNotLinear(column, expanded);
                return null;
            }
            var constantChecked = MassAction(column); // the constant's own rules, at the birth volume
            var order = column.Reactants.Sum(r => r.Coefficient);
            if (order == 1 && !readsSize) return constantChecked;
            // c = k·V^(1−m): a(x) = k·V^(1−m)·∏ ff(x_i, ν_i) and v(x) = k·V^(1−m)·∏ x_i^ν_i (docs/network-language.md "Mass action").
            Expr scaled = Substitute(expanded, volume);
            if (order != 1) scaled = new BinaryExpr('*', scaled, new BinaryExpr('^', volume, new NumberExpr(1 - order, column.Position), column.Position), column.Position);
            Expr count = scaled, state = scaled;
            foreach (var (species, coefficient) in column.Reactants)
            {
                var name = new NameExpr(model.Species[species].Name, column.Position);
                for (var i = 0L; i < coefficient; i++)
                    count = new BinaryExpr('*', count, i == 0 ? name : new BinaryExpr('-', name, new NumberExpr(i, column.Position), column.Position), column.Position);
                state = new BinaryExpr('*', state, coefficient == 1 ? name : new BinaryExpr('^', name, new NumberExpr(coefficient, column.Position), column.Position), column.Position);
            }
            return Growing(column, count, state);
        }

        private ColumnKinetics Growing(Column column, Expr count, Expr state)
        {
            _growingLaws[column] = count;
            var rate = RateLaw(state);
            return rate with { CountRate = ExpressionCompiler.CompileCountLaw(count, _scope) };
        }

        // V(t) = size·2^((t − birth)/T) or size·(1 + (t − birth)/T), from the hidden parameters the simulators set.
        private static Expr Volume(CellCycleDecl cycle, SourcePosition at)
        {
            Expr age = new BinaryExpr('/',
                new BinaryExpr('-', new NameExpr(ExpressionScope.TimeName, at), new NameExpr(CellCycle.BirthName, at), at),
                new NameExpr(CellCycle.LengthName, at), at);
            Expr factor = cycle.Growth == "linear"
                ? new BinaryExpr('+', new NumberExpr(1, at), age, at)
                : new CallExpr("exp", [new BinaryExpr('*', new NumberExpr(Math.Log(2), at), age, at)], at);
            return new BinaryExpr('*', new NameExpr(ExpressionScope.SizeName, at), factor, at);
        }

        private static Expr Substitute(Expr expression, Expr volume) => expression switch
        {
            NameExpr { Name: ExpressionScope.SizeName } => volume,
            NegateExpr n => n with { Operand = Substitute(n.Operand, volume) },
            BinaryExpr b => b with { Left = Substitute(b.Left, volume), Right = Substitute(b.Right, volume) },
            CallExpr c => c with { Arguments = [.. c.Arguments.Select(a => Substitute(a, volume))] },
            CompareExpr c => c with { Left = Substitute(c.Left, volume), Right = Substitute(c.Right, volume) },
            LogicExpr l => l with { Left = Substitute(l.Left, volume), Right = Substitute(l.Right, volume) },
            NotExpr n => n with { Operand = Substitute(n.Operand, volume) },
            _ => expression,
        };

        // A law in counts that ignores the volume is right in a growing cell only when it is of degree one in
        // the counts (v(2x) = 2·v(x), as a first-order law); tried at the initial amounts plus one, and twice them.
        private void WarnIfNotLinear(Column column, Expr expanded)
        {
            var law = ExpressionCompiler.CompileStateLaw(expanded, _scope);
            var x = model.Species.Select((s, i) => (s.FractionalAmount ?? s.InitialCount) + 1.0 + i).ToArray();
            var parameters = new double[_scope.TimeSlot + 1];
            Array.Copy(_parameterValues, parameters, Math.Min(_parameterValues.Length, _scope.TimeSlot));
            var once = law(x, parameters);
            var twice = law([.. x.Select(v => 2 * v)], parameters);
            if (Math.Abs(twice - 2 * once) <= 1e-9 * Math.Abs(twice)) return;
            var lines = options.SourceLines;
            var line = lines is not null && column.Position.Line >= 1 && column.Position.Line <= lines.Count ? lines[column.Position.Line - 1] : "";
            _cycleWarnings.Add(new Diagnostic(model.File, column.Position,
                $"reaction '{column.Name}' has a rate law in counts that does not use 'size', so it ignores the growing volume; " +
                "write 'size' where the law is stated in concentrations (as in 'rate size * k' or 'rate k * A * B / size')", line));
        }
    }
}
