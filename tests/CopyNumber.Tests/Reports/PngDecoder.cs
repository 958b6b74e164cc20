using System.Buffers.Binary;
using System.IO.Compression;

namespace CopyNumber.Tests.Reports;

/// <summary>
/// A small, independent PNG reader for the tests, written from the PNG specification (W3C PNG 2nd ed.
/// 2003 = ISO/IEC 15948:2004): the 8-byte signature (§5.2), chunks of length/type/data/CRC-32 with the
/// CRC over type and data (§5.3, Annex D), IHDR first holding width and height big-endian (§11.2.2),
/// IDAT data as one zlib stream (§10), each scanline a filter byte then the filtered bytes, with filters
/// None/Sub/Up/Average/Paeth (§9). Only what ScottPlot/SkiaSharp write is supported: 8-bit RGB or RGBA,
/// not interlaced; anything else fails the test that meets it.
/// </summary>
internal sealed class PngDecoder
{
    public static readonly byte[] Signature = [0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A];

    public int Width { get; private init; }
    public int Height { get; private init; }

    /// <summary>Pixels as RGBA bytes, row by row from the top.</summary>
    public byte[] Rgba { get; private init; } = [];

    /// <summary>Width and height read from IHDR alone, after checking the signature and IHDR's place and length.</summary>
    public static (int Width, int Height) ReadSize(byte[] png)
    {
        Assert.True(png.Length >= 33, "too short for signature + IHDR");
        Assert.Equal(Signature, png[..8]);
        Assert.Equal(13u, BinaryPrimitives.ReadUInt32BigEndian(png.AsSpan(8)));
        Assert.Equal("IHDR"u8.ToArray(), png[12..16]);
        return ((int)BinaryPrimitives.ReadUInt32BigEndian(png.AsSpan(16)), (int)BinaryPrimitives.ReadUInt32BigEndian(png.AsSpan(20)));
    }

    /// <summary>Full decode; asserts every CRC, the chunk order and the inflated size.</summary>
    public static PngDecoder Decode(byte[] png)
    {
        var (width, height) = ReadSize(png);
        int offset = 8, channels = 0;
        bool sawEnd = false;
        using var idat = new MemoryStream();
        while (offset < png.Length)
        {
            int length = (int)BinaryPrimitives.ReadUInt32BigEndian(png.AsSpan(offset));
            var typeAndData = png.AsSpan(offset + 4, 4 + length);
            uint crc = BinaryPrimitives.ReadUInt32BigEndian(png.AsSpan(offset + 8 + length));
            Assert.Equal(Crc32(typeAndData), crc);
            string type = System.Text.Encoding.ASCII.GetString(typeAndData[..4]);
            var data = typeAndData[4..];
            if (type == "IHDR")
            {
                Assert.Equal(8, offset); // IHDR must be the first chunk
                Assert.Equal(8, data[8]); // bit depth
                channels = data[9] switch { 2 => 3, 6 => 4, _ => throw new InvalidDataException($"colour type {data[9]}") };
                Assert.Equal(0, data[12]); // no interlace
            }
            else if (type == "IDAT") idat.Write(data);
            else if (type == "IEND")
            {
                sawEnd = true;
                Assert.Equal(png.Length, offset + 12 + length); // nothing after IEND
            }
            offset += 12 + length;
        }
        Assert.True(sawEnd, "no IEND chunk");

        idat.Position = 0;
        using var inflated = new MemoryStream();
        using (var z = new ZLibStream(idat, CompressionMode.Decompress)) z.CopyTo(inflated);
        byte[] raw = inflated.ToArray();
        int stride = width * channels;
        Assert.Equal(height * (stride + 1), raw.Length);

        var pixels = new byte[height * stride];
        for (int y = 0; y < height; y++)
        {
            byte filter = raw[y * (stride + 1)];
            for (int x = 0; x < stride; x++)
            {
                int a = x >= channels ? pixels[y * stride + x - channels] : 0;
                int b = y > 0 ? pixels[(y - 1) * stride + x] : 0;
                int c = x >= channels && y > 0 ? pixels[(y - 1) * stride + x - channels] : 0;
                int value = raw[y * (stride + 1) + 1 + x];
                int predictor = filter switch
                {
                    0 => 0,
                    1 => a,
                    2 => b,
                    3 => (a + b) / 2,
                    4 => Paeth(a, b, c),
                    _ => throw new InvalidDataException($"filter {filter}"),
                };
                pixels[y * stride + x] = (byte)(value + predictor);
            }
        }

        var rgba = new byte[width * height * 4];
        for (int i = 0; i < width * height; i++)
        {
            for (int k = 0; k < 3; k++) rgba[4 * i + k] = pixels[channels * i + k];
            rgba[4 * i + 3] = channels == 4 ? pixels[channels * i + 3] : (byte)255;
        }
        return new PngDecoder { Width = width, Height = height, Rgba = rgba };
    }

    /// <summary>Number of pixels within <paramref name="tolerance"/> per channel of the given opaque colour.</summary>
    public int CountNear(byte r, byte g, byte b, int tolerance = 2)
    {
        int count = 0;
        for (int i = 0; i < Rgba.Length; i += 4)
            if (Math.Abs(Rgba[i] - r) <= tolerance && Math.Abs(Rgba[i + 1] - g) <= tolerance &&
                Math.Abs(Rgba[i + 2] - b) <= tolerance && Rgba[i + 3] == 255)
                count++;
        return count;
    }

    /// <summary>The pixel at (x, y), y from the top.</summary>
    public (byte R, byte G, byte B) At(int x, int y)
    {
        int i = 4 * (y * Width + x);
        return (Rgba[i], Rgba[i + 1], Rgba[i + 2]);
    }

    private static int Paeth(int a, int b, int c)
    {
        int p = a + b - c, pa = Math.Abs(p - a), pb = Math.Abs(p - b), pc = Math.Abs(p - c);
        return pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
    }

    /// <summary>CRC-32 as in PNG Annex D (polynomial 0xEDB88320, reflected, init and final xor 0xFFFFFFFF).</summary>
    private static uint Crc32(ReadOnlySpan<byte> bytes)
    {
        uint crc = 0xFFFFFFFF;
        foreach (byte b in bytes)
        {
            crc ^= b;
            for (int k = 0; k < 8; k++) crc = (crc & 1) != 0 ? 0xEDB88320 ^ (crc >> 1) : crc >> 1;
        }
        return crc ^ 0xFFFFFFFF;
    }
}
