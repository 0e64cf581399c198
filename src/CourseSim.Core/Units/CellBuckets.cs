namespace CourseSim.Units;

/// <summary>
/// The bucket arithmetic of the spatial hashes filled by counting sort (the engine's cell hash of boards, the wind's hash
/// of shadow sources): square cells hashed into a power-of-two number of buckets, about twice as many as items, so a
/// rebuild is O(N) however far the items spread.
/// </summary>
public static class CellBuckets
{
    /// <summary>The bucket of cell (i, j) for a bucket count of mask + 1 (a power of two).</summary>
    public static int Hash(int i, int j, int mask) => (int)(((uint)i * 0x9E3779B1u) ^ ((uint)j * 0x85EBCA77u)) & mask;

    /// <summary>Buckets for n items: the least power of two that is at least 2 n, and at least 64.</summary>
    public static int CountFor(int n)
    {
        int buckets = 64;
        while (buckets < 2 * n) buckets *= 2;
        return buckets;
    }
}
