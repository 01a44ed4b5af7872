"""The span reader: a narrow interface, pure-numpy span decoding, and the transformer implementation."""
