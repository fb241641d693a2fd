using Orchard.Core.Geometry;
using Orchard.Core.Model;
using Orchard.Core.Randomness;

namespace Orchard.Core.Kinematics;

/// <summary>
/// Numerical inverse kinematics of a full 6-DOF TCP pose by damped least squares from several seeds.
/// <para>
/// Each step solves Δq = J_wᵀ (J_w J_wᵀ + λ² I)⁻¹ e_w, the damped least-squares (Levenberg–Marquardt)
/// step of Wampler, "Manipulator inverse kinematic solutions based on vector formulations and damped
/// least-squares methods" (IEEE Trans. SMC 16(1), 1986) and Nakamura and Hanafusa, "Inverse kinematic
/// solutions with singularity robustness for robot manipulator control" (ASME J. Dyn. Sys. Meas. Control
/// 108(3), 1986), as surveyed by Buss, "Introduction to Inverse Kinematics with Jacobian Transpose,
/// Pseudoinverse and Damped Least Squares methods" (2004), §5 (titles, volumes and section recalled from
/// memory). The 6 × 6 system is solved by Cholesky on the stack, so it serves redundant arms (n &gt; 6)
/// as well. e = [p* − p; w·rotvec(R* Rᵀ)] is the pose error in the root frame and J_w the Jacobian
/// with its angular rows scaled by the same w (<see cref="InverseKinematicsSettings.OrientationWeightM"/>).
/// With adaptive damping, a step that does not lower |e_w| is discarded and λ raised, as in
/// Marquardt's method.
/// </para>
/// <para>
/// Joint limits: every step ends inside them. A joint resting on a limit that the step pushes further
/// out is taken out of that step and the step solved again (see <see cref="DampedStep"/>); any other
/// value past a limit is clamped, except that a revolute value is first wrapped by ±2π when that lands
/// inside its limits (the same pose), so a roll with ±180° limits turns through ±π freely.
/// </para>
/// <para>
/// Immutable and thread-safe; randomness comes only from the <see cref="DeterministicRandom"/> passed
/// in, so a solve is reproducible from its seed. <see cref="SolveFromSeed"/> does not allocate;
/// <see cref="Solve(in Pose3, ReadOnlySpan{double}, DeterministicRandom, CancellationToken)"/> allocates
/// only its result.
/// </para>
/// </summary>
public sealed class InverseKinematics
{
    private const double TwoPi = 2 * Math.PI;

    private readonly KinematicChain _chain;
    private readonly InverseKinematicsSettings _settings;
    private readonly bool[] _revolute;

    /// <exception cref="ArgumentOutOfRangeException">A setting is out of range.</exception>
    public InverseKinematics(KinematicChain chain, InverseKinematicsSettings? settings = null)
    {
        ArgumentNullException.ThrowIfNull(chain);
        _chain = chain;
        _settings = settings ?? InverseKinematicsSettings.Default;
        _settings.Validate();
        _revolute = new bool[chain.JointCount];
        for (var i = 0; i < _revolute.Length; i++)
        {
            _revolute[i] = chain.JointKinds[i] == JointKind.Revolute;
        }
    }

    public KinematicChain Chain => _chain;

    public InverseKinematicsSettings Settings => _settings;

    /// <summary>Solves from random seeds only (<see cref="InverseKinematicsSettings.RandomSeedCount"/> of them).</summary>
    public InverseKinematicsResult Solve(in Pose3 target, DeterministicRandom random, CancellationToken cancellationToken = default) =>
        Solve(target, ReadOnlySpan<double>.Empty, random, cancellationToken);

    /// <summary>
    /// Solves for <paramref name="target"/> (the TCP pose in the chain's root frame) from the caller's
    /// seeds, then from <see cref="InverseKinematicsSettings.RandomSeedCount"/> random seeds drawn
    /// uniformly within the limits from <paramref name="random"/>. Returns the distinct solutions,
    /// nearest the first seed (the caller's first, else the first random one) first.
    /// </summary>
    /// <param name="seeds">Zero or more seed configurations, back to back: k · <see cref="KinematicChain.JointCount"/> values. Clamped into the limits before use.</param>
    /// <param name="cancellationToken">Checked before each seed; when set, the solutions found so far are returned and the statistics say so.</param>
    /// <exception cref="ArgumentException">The seeds' length is not a multiple of the joint count.</exception>
    public InverseKinematicsResult Solve(
        in Pose3 target,
        ReadOnlySpan<double> seeds,
        DeterministicRandom random,
        CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(random);
        var n = _chain.JointCount;
        if (seeds.Length % n != 0)
        {
            throw new ArgumentException($"Seeds come in groups of {n} joint values; got {seeds.Length} values.", nameof(seeds));
        }

        var callerSeeds = seeds.Length / n;
        var totalSeeds = callerSeeds + _settings.RandomSeedCount;
        var maxSolutions = _settings.MaxSolutions ?? int.MaxValue;
        var lower = _chain.LowerLimits;
        var upper = _chain.UpperLimits;

        Span<double> seed = stackalloc double[n];
        Span<double> firstSeed = stackalloc double[n];
        Span<double> candidate = stackalloc double[n];
        var solutions = new List<InverseKinematicsSolution>();
        var solutionJoints = new List<double[]>();
        int iterations = 0, seedsTried = 0, seedsConverged = 0;
        var cancelled = false;

        for (var s = 0; s < totalSeeds; s++)
        {
            if (cancellationToken.IsCancellationRequested)
            {
                cancelled = true;
                break;
            }

            if (s < callerSeeds)
            {
                seeds.Slice(s * n, n).CopyTo(seed);
            }
            else
            {
                for (var i = 0; i < n; i++)
                {
                    seed[i] = random.NextDouble(lower[i], upper[i]);
                }
            }

            if (s == 0)
            {
                seed.CopyTo(firstSeed);
            }

            seedsTried++;
            var attempt = SolveFromSeed(target, seed, candidate);
            iterations += attempt.Iterations;
            if (!attempt.Converged)
            {
                continue;
            }

            seedsConverged++;
            if (IsNearAny(candidate, solutionJoints))
            {
                continue;
            }

            var joints = candidate.ToArray();
            solutionJoints.Add(joints);
            solutions.Add(new InverseKinematicsSolution(
                joints,
                attempt.PositionErrorM,
                attempt.OrientationErrorRad,
                Distance(candidate, firstSeed),
                s,
                attempt.Iterations));
            if (solutions.Count >= maxSolutions)
            {
                break;
            }
        }

        solutions.Sort(static (a, b) =>
        {
            var byDistance = a.DistanceToFirstSeed.CompareTo(b.DistanceToFirstSeed);
            return byDistance != 0 ? byDistance : a.SeedIndex.CompareTo(b.SeedIndex);
        });
        return new InverseKinematicsResult(
            solutions,
            new InverseKinematicsStatistics(iterations, seedsTried, seedsConverged, cancelled));
    }

    /// <summary>
    /// Damped least squares from one seed, without allocating. <paramref name="solution"/> receives the
    /// final configuration (within the limits) whether or not it converged.
    /// </summary>
    /// <param name="seed">One value per joint; clamped into the limits.</param>
    /// <param name="solution">One value per joint; may be the same memory as <paramref name="seed"/>.</param>
    public InverseKinematicsAttempt SolveFromSeed(in Pose3 target, ReadOnlySpan<double> seed, Span<double> solution)
    {
        var n = _chain.JointCount;
        if (seed.Length != n || solution.Length != n)
        {
            throw new ArgumentException($"Seed and solution need {n} joint values each.");
        }

        var settings = _settings;
        var weight = settings.OrientationWeightM;
        var lower = _chain.LowerLimits;
        var upper = _chain.UpperLimits;
        ReadOnlySpan<bool> revolute = _revolute;

        Span<double> q = solution;
        seed.CopyTo(q);
        for (var i = 0; i < n; i++)
        {
            q[i] = Math.Clamp(q[i], lower[i], upper[i]);
        }

        Span<double> jacobian = stackalloc double[6 * n];
        Span<double> trialJacobian = stackalloc double[6 * n];
        Span<double> trial = stackalloc double[n];
        Span<double> error = stackalloc double[6];
        Span<double> trialError = stackalloc double[6];
        Span<double> normal = stackalloc double[36];
        Span<double> rhs = stackalloc double[6];
        Span<bool> locked = stackalloc bool[n];

        var pose = _chain.Evaluate(q, default, jacobian);
        var cost = PoseError(target, pose, weight, error, out var positionError, out var orientationError);
        var lambda = settings.Damping;
        var iterations = 0;

        while (true)
        {
            if (positionError <= settings.PositionToleranceM && orientationError <= settings.OrientationToleranceRad)
            {
                return new InverseKinematicsAttempt(true, positionError, orientationError, iterations);
            }

            if (iterations >= settings.MaxIterations)
            {
                break;
            }

            iterations++;
            if (!DampedStep(jacobian, error, q, lambda * lambda, weight, lower, upper, revolute, locked, normal, rhs, trial))
            {
                // Only possible when λ² vanishes against a singular J_w J_wᵀ; damp harder.
                if (!Raise(ref lambda, settings))
                {
                    break;
                }

                continue;
            }

            // Cap the step's length, then clamp it into the limits.
            var stepSquared = 0.0;
            foreach (var dq in trial)
            {
                stepSquared += dq * dq;
            }

            var scale = stepSquared > settings.MaxStepNorm * settings.MaxStepNorm
                ? settings.MaxStepNorm / Math.Sqrt(stepSquared)
                : 1.0;
            for (var i = 0; i < n; i++)
            {
                trial[i] = IntoLimits(q[i] + (scale * trial[i]), lower[i], upper[i], revolute[i]);
            }

            var trialPose = _chain.Evaluate(trial, default, trialJacobian);
            var trialCost = PoseError(target, trialPose, weight, trialError, out var trialPositionError, out var trialOrientationError);
            if (!settings.AdaptiveDamping || trialCost < cost)
            {
                trial.CopyTo(q);
                trialJacobian.CopyTo(jacobian);
                trialError.CopyTo(error);
                cost = trialCost;
                positionError = trialPositionError;
                orientationError = trialOrientationError;
                if (settings.AdaptiveDamping)
                {
                    lambda = Math.Max(lambda * settings.DampingDecrease, settings.MinDamping);
                }
            }
            else if (!Raise(ref lambda, settings))
            {
                break;
            }
        }

        return new InverseKinematicsAttempt(
            positionError <= settings.PositionToleranceM && orientationError <= settings.OrientationToleranceRad,
            positionError,
            orientationError,
            iterations);
    }

    /// <summary>
    /// Writes e_w = [p* − p; w·rotvec(R* Rᵀ)] and returns |e_w|²; also the unweighted position and
    /// orientation errors.
    /// </summary>
    private static double PoseError(in Pose3 target, in Pose3 pose, double weight, Span<double> error, out double positionError, out double orientationError)
    {
        var dp = target.Translation - pose.Translation;
        var dr = (target.Rotation * pose.Rotation.Transposed).ToRotationVector();
        error[0] = dp.X;
        error[1] = dp.Y;
        error[2] = dp.Z;
        error[3] = weight * dr.X;
        error[4] = weight * dr.Y;
        error[5] = weight * dr.Z;
        var positionSquared = dp.LengthSquared;
        var orientationSquared = dr.LengthSquared;
        positionError = Math.Sqrt(positionSquared);
        orientationError = Math.Sqrt(orientationSquared);
        return positionSquared + (weight * weight * orientationSquared);
    }

    /// <summary>
    /// The damped least-squares step Δq = J_wᵀ (J_w J_wᵀ + λ² I)⁻¹ e_w into <paramref name="step"/>, with
    /// joints held at a limit they are pushed against taken out: such a joint's column is dropped and the
    /// step solved again, until no held joint is pushed outwards (the "clamping loop" of Baerlocher and
    /// Boulic, The Visual Computer 20(6), 2004; recalled from memory). Without it a seed resting on a
    /// limit (the lift at the bottom of its mast, say) loses most of every step to the clamp and crawls.
    /// </summary>
    /// <returns>False when the 6 × 6 system is not positive definite.</returns>
    private static bool DampedStep(
        ReadOnlySpan<double> jacobian,
        ReadOnlySpan<double> error,
        ReadOnlySpan<double> q,
        double dampingSquared,
        double weight,
        ReadOnlySpan<double> lower,
        ReadOnlySpan<double> upper,
        ReadOnlySpan<bool> revolute,
        Span<bool> locked,
        Span<double> normal,
        Span<double> rhs,
        Span<double> step)
    {
        var n = q.Length;
        locked.Clear();

        // Each pass either locks one more joint or returns, so n + 1 passes suffice.
        for (var pass = 0; pass <= n; pass++)
        {
            BuildNormalMatrix(jacobian, n, weight, dampingSquared, locked, normal);
            error.CopyTo(rhs);
            if (!CholeskySolver.SolveInPlace(normal, rhs, 6))
            {
                return false;
            }

            for (var r = 3; r < 6; r++)
            {
                rhs[r] *= weight;
            }

            var lockedMore = false;
            for (var c = 0; c < n; c++)
            {
                if (locked[c])
                {
                    step[c] = 0;
                    continue;
                }

                var dq = 0.0;
                for (var r = 0; r < 6; r++)
                {
                    dq += jacobian[(r * n) + c] * rhs[r];
                }

                step[c] = dq;
                if (((dq < 0 && q[c] <= lower[c]) || (dq > 0 && q[c] >= upper[c]))
                    && !(revolute[c] && IsInside(q[c] + dq - (Math.Sign(dq) * TwoPi), lower[c], upper[c])))
                {
                    locked[c] = true;
                    lockedMore = true;
                }
            }

            if (!lockedMore)
            {
                return true;
            }
        }

        return true;
    }

    /// <summary>
    /// Lower triangle of J_w J_wᵀ + damping² I (6 × 6, row-major), where J_w is J with rows 3–5 scaled by
    /// <paramref name="weight"/> and the columns of locked joints left out.
    /// </summary>
    private static void BuildNormalMatrix(ReadOnlySpan<double> jacobian, int n, double weight, double dampingSquared, ReadOnlySpan<bool> locked, Span<double> normal)
    {
        for (var r = 0; r < 6; r++)
        {
            var rowR = jacobian.Slice(r * n, n);
            var weightR = r < 3 ? 1.0 : weight;
            for (var c = 0; c <= r; c++)
            {
                var rowC = jacobian.Slice(c * n, n);
                var sum = 0.0;
                for (var k = 0; k < n; k++)
                {
                    if (!locked[k])
                    {
                        sum += rowR[k] * rowC[k];
                    }
                }

                normal[(r * 6) + c] = sum * weightR * (c < 3 ? 1.0 : weight);
            }

            normal[(r * 6) + r] += dampingSquared;
        }
    }

    /// <summary>
    /// A joint value brought into its limits: a revolute value past a limit is first wrapped by 2π (the
    /// same pose) when that lands inside, so a ±180° roll can pass through ±π; otherwise it is clamped.
    /// </summary>
    private static double IntoLimits(double value, double lower, double upper, bool revolute)
    {
        if (value > upper)
        {
            return revolute && value - TwoPi >= lower ? value - TwoPi : upper;
        }

        if (value < lower)
        {
            return revolute && value + TwoPi <= upper ? value + TwoPi : lower;
        }

        return value;
    }

    private static bool IsInside(double value, double lower, double upper) => value >= lower && value <= upper;

    /// <summary>Raises λ; false when it would pass the ceiling (the seed is stuck) or damping is fixed.</summary>
    private static bool Raise(ref double lambda, InverseKinematicsSettings settings)
    {
        if (!settings.AdaptiveDamping)
        {
            return false;
        }

        lambda *= settings.DampingIncrease;
        return lambda <= settings.MaxDamping;
    }

    private bool IsNearAny(ReadOnlySpan<double> candidate, List<double[]> found)
    {
        var threshold = _settings.DistinctnessThreshold;
        foreach (var joints in found)
        {
            if (Distance(candidate, joints) < threshold)
            {
                return true;
            }
        }

        return false;
    }

    private static double Distance(ReadOnlySpan<double> a, ReadOnlySpan<double> b)
    {
        var sum = 0.0;
        for (var i = 0; i < a.Length; i++)
        {
            var d = a[i] - b[i];
            sum += d * d;
        }

        return Math.Sqrt(sum);
    }
}
