using CopyNumber.Kinetics;
using CopyNumber.Language;

namespace CopyNumber.Network;

/// <summary>
/// Decides whether a readout is itself a copy number: an integer combination of species, built from
/// species, integer constants, <c>+</c>, <c>-</c>, unary minus, and <c>*</c> by an integer constant. An
/// integer constant is any subexpression of numbers and <c>size</c> whose value is a finite integer
/// (parameters are excluded: a schedule may change them).
/// </summary>
internal static class IntegerCombination
{
    /// <summary>Whether <paramref name="expression"/> (readouts expanded) is an integer combination of species.</summary>
    public static bool Holds(Expr expression, ExpressionScope scope)
    {
        return Combination(expression);

        bool Combination(Expr e) => e switch
        {
            NameExpr name when scope.SpeciesIndex(name.Name) >= 0 => true,
            NegateExpr negate => Combination(negate.Operand),
            BinaryExpr { Operator: '+' or '-' } sum => Combination(sum.Left) && Combination(sum.Right),
            BinaryExpr { Operator: '*' } product =>
                (Combination(product.Left) && IntegerConstant(product.Right))
                || (IntegerConstant(product.Left) && Combination(product.Right)),
            _ => IntegerConstant(e),
        };

        bool IntegerConstant(Expr e) =>
            ConstantEvaluation.TryEvaluate(e, name => name == ExpressionScope.SizeName ? scope.Size : null, out var value)
            && double.IsFinite(value) && value == Math.Floor(value);
    }
}
