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

// Products resolved for one reader: its own map in front of the run's Analysis, which
// readers share under one lock (the Analysis and its store connection are not
// thread-safe; the map makes the lock rare, once per distinct product and reader).
class ReaderResolutions {
 public:
  ReaderResolutions(Analysis& analysis, std::mutex& lock) : analysis_(analysis), lock_(lock) {}

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
  Analysis& analysis_;
  std::mutex& lock_;
  std::unordered_map<std::string, const ResolvedProduct*> seen_;
  std::string key_;
};

// One reader: its connection, the ranges it reads (every n-th), its batches.
struct Reader {
  const Store* source = nullptr;
  const Analysis* analysis = nullptr;  // read only here: the options and tables
  DosageTextCache dosages;             // this reader's own (the run's is not shared)
  std::vector<DispensingRecord> spare;  // records kept for reuse across its ranges
  std::optional<Date> latest_dispensed;  // among the records it read
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
        if (!slot.history.dispensings.empty()) {
          // In date order: the last is the patient's latest.
          const Date last = slot.history.dispensings.back().dispensed_on;
          if (!reader.latest_dispensed || *reader.latest_dispensed < last) reader.latest_dispensed = last;
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

}  // namespace

Status ForEachPatientTimeline(const Store& store, Analysis& analysis, const PassVisit& visit,
                              PassFacts* facts) {
  // Two connections need one snapshot to agree on: the caller's, or one for the pass.
  std::optional<StoreSnapshot> own_snapshot;
  if (!store.InSnapshot()) {
    // The first pass after an import packs each history once (best effort).
    if (Status packed = store.RefreshPackedHistories(); !packed.ok()) return packed;
    Result<StoreSnapshot> snapshot = store.BeginSnapshot();
    if (!snapshot.ok()) return snapshot.status();
    own_snapshot.emplace(std::move(snapshot).value());
  }
  Result<std::vector<PatientIdRange>> ranges = store.PatientRanges(kPatientsPerRange);
  if (!ranges.ok()) return ranges.status();
  // A second reader when the store has a peer connection and more than one range; the
  // store's own connection then serves only the shared resolutions. Otherwise one reader
  // on the store's connection: an in-memory store, or an import committed just now.
  std::vector<Store> peers;
  if (ranges->size() > 1) {
    for (size_t i = 0; i < kMaxReaders; ++i) {
      Result<Store> peer = store.OpenPeer();
      if (!peer.ok()) break;
      peers.push_back(std::move(peer).value());
    }
    if (peers.size() < kMaxReaders) peers.clear();
  }
  // With peers reading, the store's own connection serves only the resolutions: its map
  // is released, so that pages it mapped before the pass (a report's summary walks the
  // whole table) do not count again beside the peers' maps. Best effort.
  struct MapRelease {
    const Store* store = nullptr;
    ~MapRelease() {
      if (store != nullptr) static_cast<void>(store->UseMemoryMap(true));
    }
  } map_release;
  if (!peers.empty() && store.UseMemoryMap(false).ok()) map_release.store = &store;
  const size_t readers_used = peers.empty() ? 1 : peers.size();
  std::vector<Reader> readers(readers_used);
  std::mutex resolution_lock;
  std::vector<ReaderResolutions> resolutions;
  for (size_t i = 0; i < readers_used; ++i) {
    readers[i].source = peers.empty() ? &store : &peers[i];
    readers[i].analysis = &analysis;
    for (Batch& batch : readers[i].batches) readers[i].free.Put(&batch);
    resolutions.emplace_back(analysis, resolution_lock);
  }
  std::atomic<bool> stop{false};
  std::vector<std::thread> threads;
  for (size_t i = 0; i < readers_used; ++i) {
    threads.emplace_back(ReadRanges, std::ref(readers[i]), std::cref(*ranges), i, readers_used,
                         std::ref(resolutions[i]), std::cref(stop));
  }

  // The visitor, on this thread, in range order: range r comes from reader r % n.
  Status status;
  std::exception_ptr failure;
  long capped_patients = 0;
  std::vector<bool> reader_done(readers_used, false);
  // Takes the reader's next batch, keeping the first fault it carries.
  auto next = [&](size_t reader) {
    Batch* batch = readers[reader].filled.Take();
    if (batch->failure && !failure && status.ok()) failure = batch->failure;
    if (!batch->status.ok() && !failure && status.ok()) status = batch->status;
    if (batch->reader_done) reader_done[reader] = true;
    if (failure || !status.ok() || batch->reader_done) stop = true;
    return batch;
  };
  for (size_t r = 0; r < ranges->size() && !stop; ++r) {
    const size_t reader = r % readers_used;
    for (bool range_end = false; !range_end && !stop;) {
      Batch* batch = next(reader);
      range_end = batch->range_end;
      for (size_t i = 0; i < batch->used && !stop; ++i) {
        try {
          const Slot& slot = batch->slots[i];
          if (slot.history.dropped > 0) ++capped_patients;
          PassPatient patient(slot.history, slot.timeline, slot.matches, analysis);
          if (!visit(patient)) stop = true;
        } catch (...) {
          failure = std::current_exception();
          stop = true;
        }
      }
      readers[reader].free.Put(batch);
    }
  }
  // Stop the readers and take back every batch until each says it is done.
  stop = true;
  for (size_t reader = 0; reader < readers_used; ++reader) {
    while (!reader_done[reader]) readers[reader].free.Put(next(reader));
  }
  for (std::thread& thread : threads) thread.join();
  peers.clear();
  own_snapshot.reset();
  analysis.SaveResolutions();
  if (failure) std::rethrow_exception(failure);
  if (status.ok() && facts != nullptr) {
    facts->capped_patients = capped_patients;
    facts->history_bound = store.history_bound();
    facts->latest_dispensed.reset();
    for (const Reader& reader : readers) {
      if (reader.latest_dispensed && (!facts->latest_dispensed || *facts->latest_dispensed < *reader.latest_dispensed)) {
        facts->latest_dispensed = reader.latest_dispensed;
      }
    }
  }
  return status;
}

std::optional<std::string> CappedHistoriesNote(long patients, size_t bound) {
  if (patients <= 0) return std::nullopt;
  return std::to_string(patients) + (patients == 1 ? " patient has" : " patients have") + " more than " +
         std::to_string(bound) +
         " counting dispensings: only the latest of each are read, so figures for dates before them may miss "
         "medicines (check the source of such histories)";
}

}  // namespace medload
