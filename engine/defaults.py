"""Every tunable default in one place. Values marked "(no source)" are common practice, not measured here."""

# Reader windows (tokens). 256 tokens: measured cheaper per step than 384 on this CPU.
MAX_SEQ_LENGTH = 256
DOC_STRIDE = 96  # overlap between consecutive windows of one passage (no source: common practice)
MAX_QUERY_LENGTH = 64
MAX_ANSWER_TOKENS = 40  # longest span the decoder may return
N_BEST = 20  # candidate starts/ends considered per window (no source: common practice)
# The answer of a passage is the expected-F1 choice among its SPAN_CHOICE_CANDIDATES best spans, with span
# probabilities softmax(score / SPAN_CHOICE_TEMPERATURE) (engine.reader.span_choice). T = 1 was chosen on dev:
# T = 2 lost 1.5 F1 on TyDi-en dev (MODEL_CARD.md).
SPAN_CHOICE_CANDIDATES = 20
SPAN_CHOICE_TEMPERATURE = 1.0
READER_BATCH_SIZE = 16

# Passages (words).
PASSAGE_TARGET_WORDS = 150
PASSAGE_MAX_WORDS = 200
PASSAGE_MIN_WORDS = 100
PASSAGE_OVERLAP_SENTENCES = 1

# Retrieval: rank-bm25 BM25Okapi defaults.
BM25_K1 = 1.5
BM25_B = 0.75
BM25_EPSILON = 0.25
TOP_K_PASSAGES = 8

# Answers.
TOP_N_ANSWERS = 5
# After an abstention, the closest spans still shown, marked below the threshold (no source: a design choice).
TOP_N_BELOW_THRESHOLD = 3
LOW_CONFIDENCE_BELOW = 0.5

# Index location inside the indexed folder.
INDEX_DIR_NAME = ".excerptor"
INDEX_DB_NAME = "index.sqlite3"

# Per-file limits while ingesting.
MAX_FILE_BYTES = 200 * 1024 * 1024
MAX_FILE_SECONDS = 60.0
MAX_PDF_PAGES = 5000
PDF_IN_CHILD_PROCESS = True  # a hung PDF page is killed after MAX_FILE_SECONDS * 2 + 10 s

# Model folder (relative to the repository / installed package root).
READER_MODEL_DIR = "models/reader-v9"
