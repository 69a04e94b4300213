/**
 * Bytes of a slab: above glibc's largest dynamic mmap threshold (32 MiB), so each slab is a
 * mapping of its own. Its pages become resident only when written, and all of them go back to the
 * system when the slab is dropped, instead of staying in the allocator's heap as many small freed
 * pieces would (they then raised the solve's peak, which comes after the build).
 */
export const SLAB_BYTES = 33 * 1024 * 1024;

/** Dimension from which a build carves its pieces from slabs (below it pieces are small anyway). */
export const SLAB_MIN_DIM = 200000;

/**
 * Carves a build's pieces (on SharedArrayBuffers) out of slabs, one thread's pieces after another.
 * Regions are never reused, so every region is zeroed; a slab lives as long as any piece in it.
 */
export class PieceSlab {
  private buffer: SharedArrayBuffer | undefined;
  private used = 0;

  /** `length` elements of 4 or 8 bytes each, zeroed, aligned to 8 bytes. */
  int32(length: number): Int32Array {
    const { buffer, byteOffset } = this.take(4 * length);
    return new Int32Array(buffer, byteOffset, length);
  }

  uint32(length: number): Uint32Array {
    const { buffer, byteOffset } = this.take(4 * length);
    return new Uint32Array(buffer, byteOffset, length);
  }

  float64(length: number): Float64Array {
    const { buffer, byteOffset } = this.take(8 * length);
    return new Float64Array(buffer, byteOffset, length);
  }

  private take(bytes: number): { buffer: SharedArrayBuffer; byteOffset: number } {
    const size = Math.ceil(Math.max(bytes, 8) / 8) * 8;
    // A region larger than a slab is a mapping of its own anyway.
    if (size > SLAB_BYTES) return { buffer: new SharedArrayBuffer(size), byteOffset: 0 };
    if (!this.buffer || this.used + size > SLAB_BYTES) {
      this.buffer = new SharedArrayBuffer(SLAB_BYTES);
      this.used = 0;
    }
    const byteOffset = this.used;
    this.used += size;
    return { buffer: this.buffer, byteOffset };
  }
}
