using System.Runtime.CompilerServices;

namespace Orchard.Core.Geometry;

/// <summary>
/// A bounding-volume hierarchy (AABB tree) over a fixed set of capsules — the static scene — built once by top-down
/// median splits into a flat node array. Queries are allocation-free, non-recursive (explicit stack) and safe to run
/// from many threads at once, since the tree is immutable after construction.
/// </summary>
/// <remarks>
/// <para>Every scene capsule carries an int group (≥ 0). A query may name one group to ignore
/// (<see cref="NoGroup"/> ignores none), e.g. the branch being cut, which the shear is allowed to touch.</para>
/// <para>Results equal a brute-force loop over all non-ignored capsules exactly: <see cref="AnyOverlap(in Capsule, double, int)"/>
/// is "any <see cref="CapsuleDistance.Overlaps"/>(query, capsule, margin)" and
/// <see cref="NearestSignedDistance(in Capsule, double, int)"/> is "min(maxDistance, min <see cref="CapsuleDistance.SignedDistance"/>(query, capsule))".
/// Boxes only prune, and every box test is widened by <see cref="PruneSlackM"/> so that rounding in the box and
/// distance arithmetic can never prune a capsule the exact test would have counted.</para>
/// </remarks>
public sealed partial class CapsuleBvh
{
    /// <summary>The <c>ignoreGroup</c> value that ignores nothing.</summary>
    public const int NoGroup = -1;

    /// <summary>At most this many capsules per leaf.</summary>
    public const int MaxLeafSize = 4;

    /// <summary>
    /// Traversal stack capacity. A median split halves the capsule count at each level, so the depth is at most
    /// ⌈log2(n / <see cref="MaxLeafSize"/>)⌉ + 1 ≤ 31 for any int count, and a depth-first stack never holds more
    /// entries than the depth.
    /// </summary>
    private const int StackCapacity = 64;

    /// <summary>
    /// Box tests are widened by 1e-9 m. Rounding error in box bounds, segment closest points and the square root is a
    /// few units in the last place of the coordinates (about 1e-14 m for a scene within ±100 m), so 1 nm covers
    /// scenes up to about ±1000 km while costing nothing measurable in pruning.
    /// </summary>
    public const double PruneSlackM = 1e-9;

    private readonly Node[] _nodes;
    private readonly WideNode[] _wide;
    private readonly Capsule[] _capsules;
    private readonly BoxF[] _capsuleBounds;
    private readonly Aabb _sceneBounds;
    private readonly int[] _groups;
    private readonly int[] _originalIndex;

    /// <summary>Builds the tree over <paramref name="capsules"/>, all in group 0.</summary>
    public CapsuleBvh(ReadOnlySpan<Capsule> capsules)
        : this(capsules, ZeroGroups(capsules.Length))
    {
    }

    /// <summary>
    /// Builds the tree over <paramref name="capsules"/>; <paramref name="groups"/>[i] (≥ 0) is the group of capsule i.
    /// Capsule indices reported by queries are indices into <paramref name="capsules"/>.
    /// </summary>
    public CapsuleBvh(ReadOnlySpan<Capsule> capsules, ReadOnlySpan<int> groups)
    {
        if (groups.Length != capsules.Length)
        {
            throw new ArgumentException($"Expected {capsules.Length} groups, got {groups.Length}.", nameof(groups));
        }

        var n = capsules.Length;
        if (n >= 1 << 27)
        {
            throw new ArgumentException("At most 2^27 capsules (leaf codes pack a start index in 28 bits).", nameof(capsules));
        }

        for (var i = 0; i < n; i++)
        {
            if (!capsules[i].IsFinite || capsules[i].RadiusM < 0)
            {
                throw new ArgumentException($"Capsule {i} is not finite or has a negative radius.", nameof(capsules));
            }

            if (groups[i] < 0)
            {
                throw new ArgumentException($"Group of capsule {i} is negative ({groups[i]}); groups must be >= 0.", nameof(groups));
            }
        }

        var order = new int[n];
        var centers = new Vec3[n];
        var bounds = new Aabb[n];
        for (var i = 0; i < n; i++)
        {
            order[i] = i;
            centers[i] = capsules[i].Center;
            bounds[i] = capsules[i].Bounds;
        }

        var nodes = new Node[Math.Max(1, (2 * n) - 1)];
        var nodeCount = 0;
        var depth = 0;
        if (n > 0)
        {
            nodeCount = Build(order, centers, bounds, nodes, out depth);
        }

        _nodes = nodes.AsSpan(0, nodeCount).ToArray();
        _wide = BuildWide(_nodes);
        Depth = depth;
        _capsules = new Capsule[n];
        _capsuleBounds = new BoxF[n];
        _sceneBounds = Aabb.Empty;
        _groups = new int[n];
        _originalIndex = order;
        for (var k = 0; k < n; k++)
        {
            var i = order[k];
            _capsules[k] = capsules[i];
            _capsuleBounds[k] = new BoxF(bounds[i]);
            _sceneBounds = Aabb.Union(_sceneBounds, bounds[i]);
            _groups[k] = groups[i];
        }
    }

    /// <summary>Number of scene capsules.</summary>
    public int Count => _capsules.Length;

    /// <summary>Number of tree nodes (0 for an empty scene).</summary>
    public int NodeCount => _nodes.Length;

    /// <summary>Number of node levels (1 for a single leaf, 0 for an empty scene).</summary>
    public int Depth { get; }

    /// <summary>Box around the whole scene (<see cref="Aabb.Empty"/> when there are no capsules).</summary>
    public Aabb Bounds => _sceneBounds;

    /// <summary>
    /// True when some scene capsule not in <paramref name="ignoreGroup"/> is within <paramref name="marginM"/> of
    /// <paramref name="query"/> (see <see cref="CapsuleDistance.Overlaps"/>). Stops at the first one found.
    /// </summary>
    public bool AnyOverlap(in Capsule query, double marginM, int ignoreGroup = NoGroup)
    {
        var stats = default(BvhQueryStats);
        return AnyOverlap(query, marginM, ignoreGroup, ref stats, out _);
    }

    /// <summary>
    /// As <see cref="AnyOverlap(in Capsule, double, int)"/>, adding the work done to <paramref name="stats"/> and giving
    /// the index (into the construction list) of the capsule found, or −1.
    /// </summary>
    public bool AnyOverlap(in Capsule query, double marginM, int ignoreGroup, ref BvhQueryStats stats, out int hitIndex)
    {
        hitIndex = -1;
        stats.Queries++;
        var nodes = _nodes;
        if (nodes.Length == 0)
        {
            return false;
        }

        // A capsule can only be within the margin if its box meets the query box grown by margin (+ slack); a
        // negative growth is still exact per axis (gap ≤ rQ + rS + margin), and Overlaps decides the rest.
        var queryBox = query.Bounds.Expanded(marginM + PruneSlackM);

        // Most of an arm's capsules are nowhere near the wood: answer those at the root, before any traversal set-up.
        if (!nodes[0].Bounds.Overlaps(queryBox))
        {
            return false;
        }

        return TraverseWide(query, queryBox, marginM, ignoreGroup, ref stats, out hitIndex);
    }

    /// <summary>
    /// The smallest <see cref="CapsuleDistance.SignedDistance"/>(query, capsule) over scene capsules not in
    /// <paramref name="ignoreGroup"/>, or <paramref name="maxDistanceM"/> when none is smaller than that.
    /// A smaller <paramref name="maxDistanceM"/> prunes more.
    /// </summary>
    /// <summary>
    /// As <see cref="AnyOverlap(in Capsule, double, int)"/> for a caller that has already found the query's box,
    /// grown by <paramref name="marginM"/> + <see cref="PruneSlackM"/> (<paramref name="grownBox"/>), to meet the
    /// scene's <see cref="Bounds"/>: the traversal starts below the root.
    /// </summary>
    internal bool AnyOverlapInBounds(in Capsule query, in Aabb grownBox, double marginM, int ignoreGroup)
    {
        if (_nodes.Length == 0)
        {
            return false;
        }

        var stats = default(BvhQueryStats);
        return TraverseWide(query, grownBox, marginM, ignoreGroup, ref stats, out _);
    }

    public double NearestSignedDistance(in Capsule query, double maxDistanceM, int ignoreGroup = NoGroup)
    {
        var stats = default(BvhQueryStats);
        return NearestSignedDistance(query, maxDistanceM, ignoreGroup, ref stats, out _);
    }

    /// <summary>
    /// As <see cref="NearestSignedDistance(in Capsule, double, int)"/>, adding the work done to <paramref name="stats"/>
    /// and giving the index (into the construction list) of the nearest capsule, or −1 when none beat
    /// <paramref name="maxDistanceM"/>. Among capsules at exactly the same distance the first one met is reported.
    /// </summary>
    public double NearestSignedDistance(in Capsule query, double maxDistanceM, int ignoreGroup, ref BvhQueryStats stats, out int nearestIndex)
    {
        nearestIndex = -1;
        stats.Queries++;
        var best = maxDistanceM;
        var nodes = _nodes;
        if (nodes.Length == 0)
        {
            return best;
        }

        var capsules = _capsules;
        var capsuleBounds = _capsuleBounds;
        var groups = _groups;
        var queryBox = query.Bounds;
        var queryRadius = query.RadiusM;
        var bestPosition = -1;
        long nodesVisited = 0;
        long pairTests = 0;

        // Each entry keeps its box gap² so it can be pruned again on pop against the improved best.
        Span<int> stack = stackalloc int[StackCapacity];
        Span<double> stackGapSquared = stackalloc double[StackCapacity];
        var top = 0;
        var rootGapSquared = nodes[0].Bounds.DistanceSquared(queryBox);
        if (!CannotBeat(rootGapSquared, best))
        {
            stack[top] = 0;
            stackGapSquared[top] = rootGapSquared;
            top++;
        }

        while (top > 0)
        {
            top--;
            if (CannotBeat(stackGapSquared[top], best))
            {
                continue;
            }

            ref readonly var node = ref nodes[stack[top]];
            nodesVisited++;
            if (node.Count == 0)
            {
                var left = node.Start;
                var right = left + 1;
                var gapLeft = nodes[left].Bounds.DistanceSquared(queryBox);
                var gapRight = nodes[right].Bounds.DistanceSquared(queryBox);

                // Push the farther child first so the nearer one is opened first and tightens best sooner; the
                // pushes are branch-free (write, then keep the entry only if it can still beat best).
                var leftIsNearer = gapLeft <= gapRight;
                var far = leftIsNearer ? right : left;
                var farGap = leftIsNearer ? gapRight : gapLeft;
                var near = leftIsNearer ? left : right;
                var nearGap = leftIsNearer ? gapLeft : gapRight;
                stack[top] = far;
                stackGapSquared[top] = farGap;
                top += CannotBeat(farGap, best) ? 0 : 1;
                stack[top] = near;
                stackGapSquared[top] = nearGap;
                top += CannotBeat(nearGap, best) ? 0 : 1;
                continue;
            }

            var end = node.Start + node.Count;
            for (var k = node.Start; k < end; k++)
            {
                if (groups[k] == ignoreGroup || CannotBeat(capsuleBounds[k].DistanceSquared(queryBox), best))
                {
                    continue;
                }

                ref readonly var capsule = ref capsules[k];
                pairTests++;
                var segmentDistanceSquared = SegmentClosestPoints.SegmentSegmentDistanceSquared(query.A, query.B, capsule.A, capsule.B);

                // Skip the square root when the core distance already reaches best + both radii (+ slack): then the
                // signed distance is ≥ best and could not replace it.
                var threshold = best + queryRadius + capsule.RadiusM + PruneSlackM;
                if (threshold > 0.0 && segmentDistanceSquared >= threshold * threshold)
                {
                    continue;
                }

                var signed = CapsuleDistance.SignedFromSegmentDistanceSquared(segmentDistanceSquared, queryRadius, capsule.RadiusM);
                if (signed < best)
                {
                    best = signed;
                    bestPosition = k;
                }
            }
        }

        if (bestPosition >= 0)
        {
            nearestIndex = _originalIndex[bestPosition];
        }

        stats.NodesVisited += nodesVisited;
        stats.PairTests += pairTests;
        return best;
    }

    /// <summary>
    /// True when every capsule inside a box whose gap² to the query box is <paramref name="gapSquared"/> has a signed
    /// distance ≥ <paramref name="best"/>. Separated boxes bound the signed distance from below by their gap; touching
    /// boxes bound nothing (the capsules may interpenetrate).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static bool CannotBeat(double gapSquared, double best)
    {
        var bound = best + PruneSlackM;
        return bound > 0.0 ? gapSquared >= bound * bound : gapSquared > 0.0;
    }

    /// <summary>Top-down median split along the longest axis of the capsule centres, with an explicit work stack.</summary>
    private static int Build(int[] order, Vec3[] centers, Aabb[] bounds, Node[] nodes, out int depth)
    {
        var n = order.Length;
        var keys = new double[n];
        var work = new Stack<(int Node, int Start, int Count, int Level)>();
        work.Push((0, 0, n, 1));
        var nodeCount = 1;
        depth = 0;
        while (work.Count > 0)
        {
            var (nodeIndex, start, count, level) = work.Pop();
            depth = Math.Max(depth, level);
            var box = Aabb.Empty;
            var centerBox = Aabb.Empty;
            for (var k = start; k < start + count; k++)
            {
                box = Aabb.Union(box, bounds[order[k]]);
                var c = centers[order[k]];
                centerBox = Aabb.Union(centerBox, new Aabb(c, c));
            }

            if (count <= MaxLeafSize)
            {
                nodes[nodeIndex] = new Node(new BoxF(box), start, count);
                continue;
            }

            var size = centerBox.Size;
            var axis = size.X >= size.Y && size.X >= size.Z ? 0 : (size.Y >= size.Z ? 1 : 2);
            for (var k = start; k < start + count; k++)
            {
                var c = centers[order[k]];
                keys[k] = axis == 0 ? c.X : (axis == 1 ? c.Y : c.Z);
            }

            // Sorting the range is O(count log count); the build runs once, so simplicity wins over nth_element.
            keys.AsSpan(start, count).Sort(order.AsSpan(start, count));
            var half = count / 2;
            var left = nodeCount;
            nodeCount += 2;
            nodes[nodeIndex] = new Node(new BoxF(box), left, 0);
            work.Push((left + 1, start + half, count - half, level + 1));
            work.Push((left, start, half, level + 1));
        }

        if (depth >= StackCapacity)
        {
            throw new InvalidOperationException($"Tree depth {depth} exceeds the traversal stack ({StackCapacity}).");
        }

        return nodeCount;
    }

    private static int[] ZeroGroups(int count) => new int[count];

    /// <summary>
    /// A tree node: a leaf holds capsules [Start, Start + Count) of the reordered arrays; an inner node (Count = 0)
    /// has children Start and Start + 1.
    /// </summary>
    private readonly record struct Node(BoxF Bounds, int Start, int Count);

    /// <summary>
    /// A box stored in single precision, rounded outwards (min down, max up), so it contains the double box it was
    /// made from: half the memory of <see cref="Aabb"/> (a node is 32 bytes, two siblings 64), and since the tests
    /// widen float to double exactly, pruning stays conservative.
    /// </summary>
    private readonly struct BoxF
    {
        public BoxF(in Aabb box)
        {
            (MinX, MinY, MinZ) = (Down(box.Min.X), Down(box.Min.Y), Down(box.Min.Z));
            (MaxX, MaxY, MaxZ) = (Up(box.Max.X), Up(box.Max.Y), Up(box.Max.Z));
        }

        public float MinX { get; }

        public float MinY { get; }

        public float MinZ { get; }

        public float MaxX { get; }

        public float MaxY { get; }

        public float MaxZ { get; }

        /// <summary>Half the box's surface area (m²): the measure by which wide nodes open their largest child.</summary>
        public double HalfSurface
        {
            get
            {
                double dx = MaxX - MinX, dy = MaxY - MinY, dz = MaxZ - MinZ;
                return (dx * dy) + (dy * dz) + (dz * dx);
            }
        }

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public bool Overlaps(in Aabb query) =>
            (query.Min.X <= MaxX) & (MinX <= query.Max.X) &
            (query.Min.Y <= MaxY) & (MinY <= query.Max.Y) &
            (query.Min.Z <= MaxZ) & (MinZ <= query.Max.Z);

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public double DistanceSquared(in Aabb query)
        {
            var dx = Math.Max(0.0, Math.Max(MinX - query.Max.X, query.Min.X - MaxX));
            var dy = Math.Max(0.0, Math.Max(MinY - query.Max.Y, query.Min.Y - MaxY));
            var dz = Math.Max(0.0, Math.Max(MinZ - query.Max.Z, query.Min.Z - MaxZ));
            return (dx * dx) + (dy * dy) + (dz * dz);
        }

        /// <summary>The largest float not above <paramref name="x"/>.</summary>
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public static float Down(double x)
        {
            var f = (float)x;
            return f > x ? MathF.BitDecrement(f) : f;
        }

        /// <summary>The smallest float not below <paramref name="x"/>.</summary>
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public static float Up(double x)
        {
            var f = (float)x;
            return f < x ? MathF.BitIncrement(f) : f;
        }
    }
}
