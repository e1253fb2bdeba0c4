#include "medload/burden/patient_pass.h"

#include <atomic>
#include <condition_variable>
#include <deque>
#include <exception>
#include <mutex>
#include <thread>
#include <unordered_map>
#include <utility>

namespace medload {

const std::string& PracticeOfDispensing(const DispensingRecord& record,
                                        const std::optional<PatientRecord>& registry) {
  static const std::string kNone;
  if (!record.practice.empty()) return record.practice;
  return registry ? registry->practice : kNone;
}

void AddHistoryToSpans(const PatientHistory& history, PracticeSpans& spans) {
  const std::string* last_practice = nullptr;
  DataSpan* span = nullptr;
  for (const DispensingRecord& record : history.dispensings) {
    const std::string& practice = PracticeOfDispensing(record, history.registry);
    // A history names one practice almost always: look it up once per change.
    if (last_practice == nullptr || *last_practice != practice) {
      auto [it, added] = spans.try_emplace(practice, DataSpan{record.dispensed_on, record.dispensed_on});
      span = &it->second;
      last_practice = &practice;
    }
    span->Add(record.dispensed_on);
  }
}

Burden PassPatient::Evaluate(Date on, std::optional<int> age) const {
  return analysis_.Evaluate(timeline_, on, age, &matches_);
}

namespace {

// The pass is cut into ranges of about this many registered patients; with two
// connections, each reads every other range.
constexpr size_t kPatientsPerRange = 128;
constexpr size_t kPatientsPerBatch = 128;
// Batches each reader may have filled and not yet visited: enough for it to read ahead a
// range or two while the visitor works through the other reader's, and no more, so that
// memory stays bounded whatever the store's size.
constexpr size_t kBatchesPerReader = 4;
constexpr size_t kMaxReaders = 2;

struct Slot {
  PatientHistory history;
  std::vector<const ResolvedProduct*> products;  // products[i] resolves dispensing i
  Timeline timeline;
  std::vector<bool> matches;  // MatchRuleRequirements(timeline, the run's tables)
};

struct Batch {
  std::vector<Slot> slots = std::vector<Slot>(kPatientsPerBatch);
  size_t used = 0;
  bool range_end = false;    // the last batch of its range
  bool reader_done = false;  // the reader has stopped: nothing follows this batch
  Status status;             // a read failure; nothing follows it but reader_done
  std::exception_ptr failure;
  void Clear() {
    used = 0;
    range_end = reader_done = false;
    status = Status::Ok();
    failure = nullptr;
  }
};

// A blocking first-in first-out hand-over of batch pointers between two threads.
class Handover {
 public:
  void Put(Batch* batch) {
    {
      std::lock_guard lock(mutex_);
      queue_.push_back(batch);
    }
    ready_.notify_one();
  }
  Batch* Take() {
    std::unique_lock lock(mutex_);
    ready_.wait(lock, [&] { return !queue_.empty(); });
    Batch* batch = queue_.front();
    queue_.pop_front();
    return batch;
  }

 private:
  std::mutex mutex_;
  std::condition_variable ready_;
  std::deque<Batch*> queue_;
};

// Products resolved for one reader: its own map in front of the run's RunContext, which
// readers share under one lock (the RunContext and its store connection are not
// thread-safe; the map makes the lock rare, once per distinct product and reader).
class ReaderResolutions {
 public:
  ReaderResolutions(RunContext& analysis, std::mutex& lock) : analysis_(analysis), lock_(lock) {}

  const ResolvedProduct* Resolve(const DispensingRecord& record) {
    ProductKeyOf(record, key_);
    if (auto it = seen_.find(key_); it != seen_.end()) return it->second;
    const ResolvedProduct* product = nullptr;
    {
      std::lock_guard guard(lock_);
      product = &analysis_.Resolve(record);
    }
    seen_.emplace(key_, product);
    return product;
  }

 private:
  RunContext& analysis_;
  std::mutex& lock_;
  std::unordered_map<std::string, const ResolvedProduct*> seen_;
  std::string key_;
};

// One reader: its connection, the ranges it reads (every n-th), its batches.
struct Reader {
  const Store* source = nullptr;
  const RunContext* analysis = nullptr;  // read only here: the options and tables
  DosageTextCache dosages;             // this reader's own (the run's is not shared)
  std::vector<DispensingRecord> spare;  // records kept for reuse across its ranges
  std::optional<Date> latest_dispensed;  // among the records it read
  PracticeSpans practice_spans;          // likewise, per practice
  long capped_patients = 0;              // histories cut by the store's bound
  std::vector<Batch> batches = std::vector<Batch>(kBatchesPerReader);
  Handover free;    // batches the visitor has finished with
  Handover filled;  // batches ready to visit, in range order
};

// Reads ranges first, first + step, ... into batches until done or `stop`; always ends
// with a batch marked reader_done.
void ReadRanges(Reader& reader, const std::vector<PatientIdRange>& ranges, size_t first, size_t step,
                ReaderResolutions& resolutions, const std::atomic<bool>& stop) {
  Batch* batch = nullptr;
  auto take = [&] {
    batch = reader.free.Take();
    batch->Clear();
  };
  auto hand_over = [&] {
    Batch* ready = std::exchange(batch, nullptr);
    reader.filled.Put(ready);
  };
  try {
    for (size_t r = first; r < ranges.size() && !stop.load(std::memory_order_relaxed); r += step) {
      take();
      Result<PatientCursor> cursor = reader.source->Patients(ranges[r], &reader.spare);
      if (!cursor.ok()) {
        batch->status = cursor.status();
        hand_over();
        break;
      }
      bool failed = false;
      while (!stop.load(std::memory_order_relaxed)) {
        Slot& slot = batch->slots[batch->used];
        Result<bool> more = cursor->Next(slot.history);
        if (!more.ok()) {
          batch->status = more.status();
          failed = true;
          break;
        }
        if (!*more) break;
        const std::vector<DispensingRecord>& records = slot.history.dispensings;
        slot.products.resize(records.size());
        for (size_t i = 0; i < records.size(); ++i) slot.products[i] = resolutions.Resolve(records[i]);
        slot.timeline = reader.analysis->BuildTimeline(records, slot.products, reader.dosages);
        slot.matches = MatchRuleRequirements(slot.timeline, reader.analysis->tables());
        if (slot.history.dropped > 0) ++reader.capped_patients;
        if (!slot.history.dispensings.empty()) {
          // In date order: the last is the patient's latest.
          const Date last = slot.history.dispensings.back().dispensed_on;
          if (!reader.latest_dispensed || *reader.latest_dispensed < last) reader.latest_dispensed = last;
          AddHistoryToSpans(slot.history, reader.practice_spans);
        }
        if (++batch->used == kPatientsPerBatch) {
          hand_over();
          take();
        }
      }
      batch->range_end = true;
      hand_over();
      if (failed) break;
    }
  } catch (...) {
    // The batch being filled when the throw came (or a fresh one) carries the fault.
    if (batch == nullptr) take();
    batch->failure = std::current_exception();
    hand_over();
  }
  take();
  batch->reader_done = true;
  reader.filled.Put(batch);
}

// The pass's own snapshot (two connections need one to agree on), unless the caller has
// one open. The first pass after an import packs each history once first (best effort).
Result<std::optional<StoreSnapshot>> OpenPassSnapshot(const Store& store, const PassProgressFn& progress) {
  std::optional<StoreSnapshot> own_snapshot;
  if (store.InSnapshot()) return own_snapshot;
  if (progress) {
    const Result<bool> current = store.PackedHistoriesCurrent();
    if (current.ok() && !*current) progress(PassProgress{true, 0, 0, 0});
  }
  if (Status packed = store.RefreshPackedHistories(); !packed.ok()) return packed;
  Result<StoreSnapshot> snapshot = store.BeginSnapshot();
  if (!snapshot.ok()) return snapshot.status();
  own_snapshot.emplace(std::move(snapshot).value());
  return own_snapshot;
}

// The peer connections for a second reader: kMaxReaders of them when the store has peers
// and there is more than one range, else none (one reader then reads on the store's own
// connection: an in-memory store, or an import committed just now).
std::vector<Store> OpenPeers(const Store& store, size_t range_count) {
  std::vector<Store> peers;
  if (range_count <= 1) return peers;
  for (size_t i = 0; i < kMaxReaders; ++i) {
    Result<Store> peer = store.OpenPeer();
    if (!peer.ok()) break;
    peers.push_back(std::move(peer).value());
  }
  if (peers.size() < kMaxReaders) peers.clear();
  return peers;
}

// With peers reading, the store's own connection serves only the resolutions: its map
// is released, so that pages it mapped before the pass (a report's summary walks the
// whole table) do not count again beside the peers' maps; restored when this ends. Best
// effort.
struct MapRelease {
  const Store* store = nullptr;
  MapRelease(const Store& on, bool peers_read) {
    if (peers_read && on.UseMemoryMap(false).ok()) store = &on;
  }
  MapRelease(const MapRelease&) = delete;
  MapRelease& operator=(const MapRelease&) = delete;
  ~MapRelease() {
    if (store != nullptr) static_cast<void>(store->UseMemoryMap(true));
  }
};

// The readers of one pass, each on its thread, and the flag that stops them.
struct ReaderPool {
  std::vector<Reader> readers;
  std::mutex resolution_lock;
  std::vector<ReaderResolutions> resolutions;
  std::vector<std::thread> threads;
  std::atomic<bool> stop{false};
};

// Starts one reader per peer (or one on the store's own connection without peers), reader
// i reading ranges i, i + n, ...
void StartReaders(ReaderPool& pool, const Store& store, std::vector<Store>& peers, RunContext& run,
                  const std::vector<PatientIdRange>& ranges) {
  const size_t readers_used = peers.empty() ? 1 : peers.size();
  pool.readers = std::vector<Reader>(readers_used);
  for (size_t i = 0; i < readers_used; ++i) {
    pool.readers[i].source = peers.empty() ? &store : &peers[i];
    pool.readers[i].analysis = &run;
    for (Batch& batch : pool.readers[i].batches) pool.readers[i].free.Put(&batch);
    pool.resolutions.emplace_back(run, pool.resolution_lock);
  }
  for (size_t i = 0; i < readers_used; ++i) {
    pool.threads.emplace_back(ReadRanges, std::ref(pool.readers[i]), std::cref(ranges), i, readers_used,
                              std::ref(pool.resolutions[i]), std::cref(pool.stop));
  }
}

// What the visiting side has seen: the first fault any batch carried, which readers are
// done.
struct Visiting {
  Status status;
  std::exception_ptr failure;
  std::vector<bool> reader_done;

  // Takes the reader's next batch, keeping the first fault it carries; a fault or a
  // reader's end stops the pass.
  Batch* Next(ReaderPool& pool, size_t reader) {
    Batch* batch = pool.readers[reader].filled.Take();
    if (batch->failure && !failure && status.ok()) failure = batch->failure;
    if (!batch->status.ok() && !failure && status.ok()) status = batch->status;
    if (batch->reader_done) reader_done[reader] = true;
    if (failure || !status.ok() || batch->reader_done) pool.stop = true;
    return batch;
  }
};

// The visitor, on this thread, in range order: range r comes from reader r % n.
void VisitRanges(ReaderPool& pool, Visiting& visiting, size_t range_count, const RunContext& run,
                 const PassVisit& visit) {
  const size_t readers_used = pool.readers.size();
  long patients = 0;
  for (size_t r = 0; r < range_count && !pool.stop; ++r) {
    if (r > 0 && run.pass_progress()) run.pass_progress()(PassProgress{false, r, range_count, patients});
    const size_t reader = r % readers_used;
    for (bool range_end = false; !range_end && !pool.stop;) {
      Batch* batch = visiting.Next(pool, reader);
      range_end = batch->range_end;
      for (size_t i = 0; i < batch->used && !pool.stop; ++i) {
        try {
          const Slot& slot = batch->slots[i];
          PassPatient patient(slot.history, slot.timeline, slot.matches, run);
          ++patients;
          if (!visit(patient)) pool.stop = true;
        } catch (...) {
          visiting.failure = std::current_exception();
          pool.stop = true;
        }
      }
      pool.readers[reader].free.Put(batch);
    }
  }
  if (run.pass_progress() && !visiting.failure && visiting.status.ok()) {
    run.pass_progress()(PassProgress{false, range_count, range_count, patients});
  }
}

// Stops the readers, takes back every batch until each says it is done, joins them.
void StopReaders(ReaderPool& pool, Visiting& visiting) {
  pool.stop = true;
  for (size_t reader = 0; reader < pool.readers.size(); ++reader) {
    while (!visiting.reader_done[reader]) pool.readers[reader].free.Put(visiting.Next(pool, reader));
  }
  for (std::thread& thread : pool.threads) thread.join();
}

// Widens the facts with the dispensings a shard store's imports left to other shards: the
// latest dispensing from all of them, practice spans from those naming a practice (their
// own shard's store attributes the others).
Status AddOtherShards(const Store& store, PassFacts& facts) {
  Result<PracticeSpans> others = store.OtherShardCoverage();
  if (!others.ok()) return others.status();
  for (const auto& [practice, span] : *others) {
    if (!facts.latest_dispensed || *facts.latest_dispensed < span.latest) facts.latest_dispensed = span.latest;
  }
  others->erase("");
  MergeSpans(facts.practice_spans, *others);
  return Status::Ok();
}

// What every reader saw: the latest dispensing, each practice's span of data, the
// histories cut by the store's bound.
void CollectFacts(const Store& store, const ReaderPool& pool, PassFacts& facts) {
  facts.latest_dispensed.reset();
  facts.practice_spans.clear();
  facts.capped_patients = 0;
  facts.history_bound = store.history_bound();
  for (const Reader& reader : pool.readers) {
    facts.capped_patients += reader.capped_patients;
    MergeSpans(facts.practice_spans, reader.practice_spans);
    if (reader.latest_dispensed && (!facts.latest_dispensed || *facts.latest_dispensed < *reader.latest_dispensed)) {
      facts.latest_dispensed = reader.latest_dispensed;
    }
  }
}

}  // namespace

Status ForEachPatientTimeline(const Store& store, RunContext& analysis, const PassVisit& visit,
                              PassFacts* facts) {
  Result<std::optional<StoreSnapshot>> own_snapshot = OpenPassSnapshot(store, analysis.pass_progress());
  if (!own_snapshot.ok()) return own_snapshot.status();
  Result<std::vector<PatientIdRange>> ranges = store.PatientRanges(kPatientsPerRange);
  if (!ranges.ok()) return ranges.status();
  std::vector<Store> peers = OpenPeers(store, ranges->size());
  const MapRelease map_release(store, !peers.empty());
  ReaderPool pool;
  StartReaders(pool, store, peers, analysis, *ranges);
  Visiting visiting;
  visiting.reader_done.assign(pool.readers.size(), false);
  VisitRanges(pool, visiting, ranges->size(), analysis, visit);
  StopReaders(pool, visiting);
  peers.clear();
  own_snapshot->reset();
  analysis.SaveResolutions();
  if (visiting.failure) std::rethrow_exception(visiting.failure);
  if (!visiting.status.ok() || facts == nullptr) return visiting.status;
  CollectFacts(store, pool, *facts);
  return AddOtherShards(store, *facts);
}

std::optional<std::string> CappedHistoriesNote(long patients, size_t bound) {
  if (patients <= 0) return std::nullopt;
  return std::to_string(patients) + (patients == 1 ? " patient has" : " patients have") + " more than " +
         std::to_string(bound) +
         " counting dispensings: only the latest of each are read, so figures for dates before them may miss "
         "medicines (check the source of such histories)";
}

}  // namespace medload
