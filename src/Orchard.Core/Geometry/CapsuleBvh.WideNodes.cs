using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.Intrinsics;

namespace Orchard.Core.Geometry;

/// <summary>
/// The overlap query's tree: the binary tree collapsed to nodes of up to four children whose boxes are stored
/// side by side in single precision (one SIMD lane per child), so one node test is six vector compares instead
/// of four separate box tests and half the levels. This is the multi-BVH layout of H. Dammertz, J. Hanika and
/// A. Keller, "Shallow Bounding Volume Hierarchies for Fast SIMD Ray Tracing of Incoherent Rays" (EGSR 2008)
/// and M. Ernst and G. Greiner, "Multi Bounding Volume Hierarchies" (IEEE RT 2008), applied here to box
/// queries; the exactness argument stays the binary tree's: boxes only prune, rounded outwards.
/// </summary>
public sealed partial class CapsuleBvh
{
    /// <summary>Children per wide node: one per lane of a 128-bit float vector.</summary>
    private const int WideArity = 4;

    /// <summary>
    /// Stack of the wide traversal: each level pops one entry and pushes at most four, so the stack holds at
    /// most 3 per level plus one; the wide tree has at most half the binary tree's levels (≤ 31).
    /// </summary>
    private const int WideStackCapacity = (3 * 32) + 1;

    /// <summary>
    /// The overlap traversal over the wide nodes from the root (whose box the caller found to meet the query's).
    /// </summary>
    private bool TraverseWide(in Capsule query, in Aabb queryBox, double marginM, int ignoreGroup, ref BvhQueryStats stats, out int hitIndex)
    {
        hitIndex = -1;
        var wide = _wide;
        var capsules = _capsules;
        var capsuleBounds = _capsuleBounds;
        var groups = _groups;
        long nodesVisited = 0;
        long pairTests = 0;

        // The query box in single precision, rounded outwards: if the exact boxes meet, these do.
        var minX = Vector128.Create(Below(queryBox.Min.X));
        var minY = Vector128.Create(Below(queryBox.Min.Y));
        var minZ = Vector128.Create(Below(queryBox.Min.Z));
        var maxX = Vector128.Create(-Below(-queryBox.Max.X));
        var maxY = Vector128.Create(-Below(-queryBox.Max.Y));
        var maxZ = Vector128.Create(-Below(-queryBox.Max.Z));

        Span<int> stack = stackalloc int[WideStackCapacity];
        var top = 0;
        stack[top++] = 0;
        while (top > 0)
        {
            ref readonly var node = ref wide[stack[--top]];
            nodesVisited++;
            var meets =
                Vector128.LessThanOrEqual(node.MinX, maxX) & Vector128.GreaterThanOrEqual(node.MaxX, minX) &
                Vector128.LessThanOrEqual(node.MinY, maxY) & Vector128.GreaterThanOrEqual(node.MaxY, minY) &
                Vector128.LessThanOrEqual(node.MinZ, maxZ) & Vector128.GreaterThanOrEqual(node.MaxZ, minZ);
            var mask = meets.ExtractMostSignificantBits();
            while (mask != 0)
            {
                var lane = BitOperations.TrailingZeroCount(mask);
                mask &= mask - 1;
                var child = node.Child(lane);
                if (child >= 0)
                {
                    stack[top++] = child;
                    continue;
                }

                // A leaf: its capsules, each behind its own box.
                var (start, count) = DecodeLeaf(child);
                for (var k = start; k < start + count; k++)
                {
                    if (groups[k] == ignoreGroup || !capsuleBounds[k].Overlaps(queryBox))
                    {
                        continue;
                    }

                    pairTests++;
                    if (CapsuleDistance.Overlaps(query, capsules[k], marginM))
                    {
                        hitIndex = _originalIndex[k];
                        stats.NodesVisited += nodesVisited;
                        stats.PairTests += pairTests;
                        return true;
                    }
                }
            }
        }

        stats.NodesVisited += nodesVisited;
        stats.PairTests += pairTests;
        return false;
    }

    /// <summary>
    /// Collapses the binary tree into wide nodes: each wide node takes a binary node's two children and keeps
    /// opening its largest inner child (by box surface) until it has four children or only leaves.
    /// </summary>
    private static WideNode[] BuildWide(Node[] nodes)
    {
        if (nodes.Length == 0)
        {
            return [];
        }

        var result = new List<WideNode>();
        var work = new Stack<(int Binary, int Wide)>();
        result.Add(default);
        work.Push((0, 0));
        Span<int> children = stackalloc int[WideArity];
        while (work.Count > 0)
        {
            var (binary, at) = work.Pop();
            var count = 0;
            if (nodes[binary].Count > 0)
            {
                // A root that is itself a leaf: one child.
                children[count++] = binary;
            }
            else
            {
                children[count++] = nodes[binary].Start;
                children[count++] = nodes[binary].Start + 1;
                while (count < WideArity)
                {
                    var open = -1;
                    var largest = double.NegativeInfinity;
                    for (var c = 0; c < count; c++)
                    {
                        var area = nodes[children[c]].Bounds.HalfSurface;
                        if (nodes[children[c]].Count == 0 && area > largest)
                        {
                            (open, largest) = (c, area);
                        }
                    }

                    if (open < 0)
                    {
                        break;
                    }

                    var inner = nodes[children[open]];
                    children[open] = inner.Start;
                    children[count++] = inner.Start + 1;
                }
            }

            var node = WideNode.Empty;
            for (var c = 0; c < count; c++)
            {
                ref readonly var child = ref nodes[children[c]];
                int code;
                if (child.Count > 0)
                {
                    code = EncodeLeaf(child.Start, child.Count);
                }
                else
                {
                    code = result.Count;
                    result.Add(default);
                    work.Push((children[c], code));
                }

                node = node.With(c, child.Bounds, code);
            }

            result[at] = node;
        }

        return [.. result];
    }

    /// <summary>
    /// A float not above <paramref name="x"/>, without a branch: x is first lowered by |x|·2⁻²³ + 1e-30, at least
    /// half a float step at x, so rounding to nearest cannot land above x (at most two float steps below it).
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static float Below(double x) => (float)(x - ((Math.Abs(x) * FloatStepRelative) + 1e-30));

    /// <summary>2⁻²³: a float's step relative to its magnitude is at most this.</summary>
    private const double FloatStepRelative = 1.0 / (1 << 23);

    /// <summary>A leaf's capsule range as a negative child code: −1 − (start · 8 + count), count ≤ 4.</summary>
    private static int EncodeLeaf(int start, int count) => -1 - ((start << 3) | count);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static (int Start, int Count) DecodeLeaf(int code)
    {
        var bits = -1 - code;
        return (bits >> 3, bits & 7);
    }

    /// <summary>Four child boxes as lanes (an unused lane has an empty box, min +∞ and max −∞) and their codes.</summary>
    private readonly struct WideNode
    {
        private readonly int _child0, _child1, _child2, _child3;

        private WideNode(Vector128<float> minX, Vector128<float> minY, Vector128<float> minZ, Vector128<float> maxX, Vector128<float> maxY, Vector128<float> maxZ, int c0, int c1, int c2, int c3)
        {
            (MinX, MinY, MinZ, MaxX, MaxY, MaxZ) = (minX, minY, minZ, maxX, maxY, maxZ);
            (_child0, _child1, _child2, _child3) = (c0, c1, c2, c3);
        }

        public static WideNode Empty => new(
            Vector128.Create(float.PositiveInfinity), Vector128.Create(float.PositiveInfinity), Vector128.Create(float.PositiveInfinity),
            Vector128.Create(float.NegativeInfinity), Vector128.Create(float.NegativeInfinity), Vector128.Create(float.NegativeInfinity),
            0, 0, 0, 0);

        public Vector128<float> MinX { get; }

        public Vector128<float> MinY { get; }

        public Vector128<float> MinZ { get; }

        public Vector128<float> MaxX { get; }

        public Vector128<float> MaxY { get; }

        public Vector128<float> MaxZ { get; }

        /// <summary>The child in <paramref name="lane"/>: ≥ 0 a wide node's index, &lt; 0 a leaf's code.</summary>
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public int Child(int lane) => lane switch
        {
            0 => _child0,
            1 => _child1,
            2 => _child2,
            _ => _child3,
        };

        public WideNode With(int lane, in BoxF box, int code) => new(
            MinX.WithElement(lane, box.MinX), MinY.WithElement(lane, box.MinY), MinZ.WithElement(lane, box.MinZ),
            MaxX.WithElement(lane, box.MaxX), MaxY.WithElement(lane, box.MaxY), MaxZ.WithElement(lane, box.MaxZ),
            lane == 0 ? code : _child0, lane == 1 ? code : _child1, lane == 2 ? code : _child2, lane == 3 ? code : _child3);
    }
}
