// A typed column of numbers, in a plain ArrayBuffer or, when worker threads are to read or write
// it, in a SharedArrayBuffer (the same numbers either way).
type ColumnType = Float64ArrayConstructor | Float32ArrayConstructor | Int32ArrayConstructor | Uint32ArrayConstructor | Uint8ArrayConstructor;

/** A zeroed column of `length` numbers of `Type`; in shared memory when `shared`. */
export function newColumn<C extends ColumnType>(Type: C, length: number, shared = false): InstanceType<C> {
  const bytes = Type.BYTES_PER_ELEMENT * length;
  const make = Type as unknown as new (buffer: ArrayBufferLike) => InstanceType<C>;
  return new make(shared ? new SharedArrayBuffer(bytes) : new ArrayBuffer(bytes));
}
