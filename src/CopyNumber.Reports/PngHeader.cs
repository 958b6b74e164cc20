using System.Buffers.Binary;

namespace CopyNumber.Reports;

/// <summary>
/// Reads the size of a PNG image from its header: the 8-byte signature, then the IHDR chunk, which must
/// come first and holds width and height as big-endian 32-bit integers (W3C PNG specification, 2nd ed.
/// 2003 = ISO/IEC 15948:2004, §5.2 and §11.2.2).
/// </summary>
internal static class PngHeader
{
    private static ReadOnlySpan<byte> Signature => [0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A];

    /// <summary>The image's size in pixels, or null when the bytes do not start like a PNG.</summary>
    public static (int Width, int Height)? TryReadSize(byte[]? png)
    {
        if (png is null || png.Length < 24 || !png.AsSpan(0, 8).SequenceEqual(Signature)) return null;
        var ihdr = png.AsSpan(8);
        if (BinaryPrimitives.ReadUInt32BigEndian(ihdr) != 13 || !ihdr.Slice(4, 4).SequenceEqual("IHDR"u8)) return null;
        uint width = BinaryPrimitives.ReadUInt32BigEndian(ihdr[8..]);
        uint height = BinaryPrimitives.ReadUInt32BigEndian(ihdr[12..]);
        if (width == 0 || height == 0 || width > int.MaxValue || height > int.MaxValue) return null;
        return ((int)width, (int)height);
    }
}
