// wav-decoder 1.3.0 ships no types; this is the part of its API we call.
declare module 'wav-decoder' {
  export interface DecodedAudio {
    numberOfChannels: number;
    length: number;
    sampleRate: number;
    channelData: Float32Array[];
  }
  export interface DecodeOptions {
    symmetric?: boolean;
  }
  interface Decode {
    (buffer: ArrayBuffer | Uint8Array, opts?: DecodeOptions): Promise<DecodedAudio>;
    sync(buffer: ArrayBuffer | Uint8Array, opts?: DecodeOptions): DecodedAudio;
  }
  const WavDecoder: { decode: Decode };
  export default WavDecoder;
}
