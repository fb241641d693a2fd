namespace Orchard.Core.Kinematics;

/// <summary>
/// Solves small dense symmetric positive-definite systems A x = b in place, by Cholesky factorisation
/// A = L Lᵀ (Golub and Van Loan, "Matrix Computations", 4th ed., 2013, §4.2; section recalled from memory).
/// Row-major storage; no allocation.
/// </summary>
internal static class CholeskySolver
{
    /// <summary>
    /// Overwrites the lower triangle of the n × n row-major <paramref name="a"/> with L and
    /// <paramref name="b"/> with the solution x. Only the lower triangle of <paramref name="a"/> is read.
    /// </summary>
    /// <returns>False when A is not (numerically) positive definite; then both spans hold garbage.</returns>
    public static bool SolveInPlace(Span<double> a, Span<double> b, int n)
    {
        for (var j = 0; j < n; j++)
        {
            var rowJ = j * n;
            var diagonal = a[rowJ + j];
            for (var k = 0; k < j; k++)
            {
                diagonal -= a[rowJ + k] * a[rowJ + k];
            }

            if (!(diagonal > 0))
            {
                return false;
            }

            var ljj = Math.Sqrt(diagonal);
            a[rowJ + j] = ljj;
            for (var i = j + 1; i < n; i++)
            {
                var rowI = i * n;
                var sum = a[rowI + j];
                for (var k = 0; k < j; k++)
                {
                    sum -= a[rowI + k] * a[rowJ + k];
                }

                a[rowI + j] = sum / ljj;
            }
        }

        // L y = b.
        for (var i = 0; i < n; i++)
        {
            var rowI = i * n;
            var sum = b[i];
            for (var k = 0; k < i; k++)
            {
                sum -= a[rowI + k] * b[k];
            }

            b[i] = sum / a[rowI + i];
        }

        // Lᵀ x = y.
        for (var i = n - 1; i >= 0; i--)
        {
            var sum = b[i];
            for (var k = i + 1; k < n; k++)
            {
                sum -= a[(k * n) + i] * b[k];
            }

            b[i] = sum / a[(i * n) + i];
        }

        return true;
    }
}
