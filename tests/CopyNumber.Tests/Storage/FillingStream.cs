namespace CopyNumber.Tests.Storage;

/// <summary>
/// A file stream that behaves like a disk with <c>capacity</c> bytes free: the write that would pass
/// the limit fails with the error Linux reports for a full disk (ENOSPC, errno 28, which .NET carries
/// in <see cref="Exception.HResult"/> on Unix).
/// </summary>
internal sealed class FillingStream(string path, long capacity) : Stream
{
    private readonly FileStream _file = new(path, FileMode.CreateNew, FileAccess.ReadWrite);
    private long _written;

    public override bool CanRead => _file.CanRead;
    public override bool CanSeek => _file.CanSeek;
    public override bool CanWrite => _file.CanWrite;
    public override long Length => _file.Length;

    public override long Position
    {
        get => _file.Position;
        set => _file.Position = value;
    }

    public override void Flush() => _file.Flush();
    public override int Read(byte[] buffer, int offset, int count) => _file.Read(buffer, offset, count);
    public override long Seek(long offset, SeekOrigin origin) => _file.Seek(offset, origin);
    public override void SetLength(long value) => _file.SetLength(value);
    public override void Write(byte[] buffer, int offset, int count) => Write(buffer.AsSpan(offset, count));

    public override void Write(ReadOnlySpan<byte> buffer)
    {
        if (_written + buffer.Length > capacity) throw new IOException("No space left on device", 28);
        _written += buffer.Length;
        _file.Write(buffer);
    }

    public override Task WriteAsync(byte[] buffer, int offset, int count, CancellationToken cancellationToken) =>
        WriteAsync(buffer.AsMemory(offset, count), cancellationToken).AsTask();

    public override ValueTask WriteAsync(ReadOnlyMemory<byte> buffer, CancellationToken cancellationToken = default)
    {
        try
        {
            Write(buffer.Span);
            return ValueTask.CompletedTask;
        }
        catch (IOException e)
        {
            return ValueTask.FromException(e);
        }
    }

    public override void WriteByte(byte value) => Write([value]);

    protected override void Dispose(bool disposing)
    {
        if (disposing) _file.Dispose();
        base.Dispose(disposing);
    }
}
