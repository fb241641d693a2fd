using Orchard.Core.Kinematics;
using Orchard.Core.Randomness;

namespace Orchard.Core.Tests.Kinematics;

public sealed class CholeskySolverTests
{
    [Fact]
    public void Solves_random_6x6_positive_definite_systems()
    {
        // A = M Mᵀ + 0.1 I is symmetric positive definite; check A x = b by multiplying back.
        var random = new DeterministicRandom(66);
        Span<double> m = stackalloc double[36];
        Span<double> a = stackalloc double[36];
        Span<double> factor = stackalloc double[36];
        Span<double> b = stackalloc double[6];
        Span<double> x = stackalloc double[6];
        for (var k = 0; k < 200; k++)
        {
            for (var i = 0; i < 36; i++)
            {
                m[i] = random.NextDouble(-1, 1);
            }

            for (var r = 0; r < 6; r++)
            {
                b[r] = random.NextDouble(-1, 1);
                for (var c = 0; c < 6; c++)
                {
                    var sum = r == c ? 0.1 : 0.0;
                    for (var j = 0; j < 6; j++)
                    {
                        sum += m[(r * 6) + j] * m[(c * 6) + j];
                    }

                    a[(r * 6) + c] = sum;
                }
            }

            a.CopyTo(factor);
            b.CopyTo(x);
            Assert.True(CholeskySolver.SolveInPlace(factor, x, 6));
            for (var r = 0; r < 6; r++)
            {
                var ax = 0.0;
                for (var c = 0; c < 6; c++)
                {
                    ax += a[(r * 6) + c] * x[c];
                }

                Assert.True(Math.Abs(ax - b[r]) < 1e-9, $"system {k}, row {r}: A x = {ax}, b = {b[r]}.");
            }
        }
    }

    [Fact]
    public void Reports_a_matrix_that_is_not_positive_definite()
    {
        // diag(1, −1): a negative pivot.
        Span<double> a = [1, 0, 0, -1];
        Span<double> b = [1, 1];
        Assert.False(CholeskySolver.SolveInPlace(a, b, 2));
    }
}
